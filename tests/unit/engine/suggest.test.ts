import { describe, expect, it } from 'vitest'
import { scoreFingering } from '../../../shared/engine/ergonomics'
import { scalePhases } from '../../../shared/engine/scale'
import { sequencePeriod, suggestFingering } from '../../../shared/engine/suggest'
import type { Finger } from '../../../shared/engine/types'
import { HARMONIC_MINOR_SCALE_FINGERINGS, MAJOR_SCALE_FINGERINGS, MELODIC_MINOR_SCALE_FINGERINGS, printedFingers, scaleCase, scaleNotes, type ScaleFingering } from './fixtures/scales'

const SCALES = [...MAJOR_SCALE_FINGERINGS, ...HARMONIC_MINOR_SCALE_FINGERINGS, ...MELODIC_MINOR_SCALE_FINGERINGS]

const SCALE_CASES = SCALES.flatMap(scale =>
  (['right', 'left'] as const).flatMap(hand => ([1, 2] as const).map(octaves => ({ scale, hand, octaves, name: `${scale.key} ${hand} ${octaves}` }))))

/** The row's fingers over `octaves`, with each start and top note the books also print. */
function printedVariants(scale: ScaleFingering, hand: 'right' | 'left', octaves: number): Finger[][] {
  const starts = hand === 'right' ? scale.rightStartAlternatives ?? [] : []
  const tops = hand === 'right' ? scale.rightTopAlternatives ?? [] : []
  const rows = [undefined, ...starts].map(first => printedFingers(scale, hand, octaves, first))
  return [...rows, ...rows.flatMap(row => tops.map(top => row.map((f, i) => (i === 7 * octaves ? top : f))))]
}

function printedFingerings(c: (typeof SCALE_CASES)[number]): Finger[][] {
  return printedVariants(c.scale, c.hand, c.octaves)
}

// Every row of fixtures/scales.ts (common practice, from memory; see its header), each hand, one and
// two octaves up and down: the suggestion must give the row's fingering note for note.
describe('major and minor scales, up and down, against the scale table', () => {
  it.each(SCALE_CASES)('$name octave(s): the table\'s fingering', (c) => {
    const { notes } = scaleCase(c.scale, c.hand, c.octaves)
    expect(printedFingerings(c)).toContainEqual(suggestFingering({ hand: c.hand, notes }).fingers)
  })

  it('tells the rows apart: a fingering shifted by one place of the pattern is not accepted', () => {
    // Guards the comparison itself: C major's right hand with the thumb under on G instead of F.
    const c = SCALE_CASES.find(x => x.name === 'C right 1')!
    expect(printedFingerings(c)).not.toContainEqual([1, 2, 3, 4, 1, 2, 3, 4, 3, 2, 1, 4, 3, 2, 1])
  })
})

/**
 * Longer runs: the table gives two octaves, and a longer scale repeats its middle octave (common
 * practice). Before the thumb's second place in a seven-note scale became a convention (scale.ts), the
 * left hand's C, G and D over three and four octaves crossed 4 over the thumb before the fifth degree.
 */
const LONG_CASES = SCALES.flatMap(scale =>
  (['right', 'left'] as const).flatMap(hand => [3, 4].map(octaves => ({ scale, hand, octaves, name: `${scale.key} ${hand} ${octaves}` }))))

function longCase(c: (typeof LONG_CASES)[number]): { notes: number[], printed: Finger[][] } {
  return { notes: scaleNotes(c.scale, c.scale.tonic - (c.hand === 'left' ? 24 : 12), c.octaves), printed: printedVariants(c.scale, c.hand, c.octaves) }
}

describe('major and minor scales over three and four octaves', () => {
  it.each(LONG_CASES)('$name octaves: the table\'s pattern', (c) => {
    const { notes, printed } = longCase(c)
    expect(printed).toContainEqual(suggestFingering({ hand: c.hand, notes }).fingers)
  })
})

describe('scale runs', () => {
  const up = (start: number, steps: number[]): number[] => steps.map(s => start + s)
  const upAndDown = (notes: number[]): number[] => [...notes, ...notes.slice(0, -1).reverse()]

  it('keeps one finger per pitch class away from the turns', () => {
    const notes = upAndDown(up(62, [0, 2, 4, 5, 7, 9, 11, 12, 14, 16, 17, 19, 21, 23, 24]))
    const fingers = suggestFingering({ hand: 'right', notes }).fingers as Finger[]
    const byClass = new Map<number, Set<Finger>>()
    notes.forEach((m, i) => {
      if (i === 0 || i === notes.length - 1 || i === 14) return
      byClass.set(m % 12, new Set([...(byClass.get(m % 12) ?? []), fingers[i]!]))
    })
    for (const used of byClass.values()) expect(used.size).toBe(1)
  })

  it('leaves the pattern at a turn only where that saves a thumb crossing', () => {
    // Common practice: the right hand's top C of C major on 5 (the pattern's thumb would pass under 4
    // and straight back), but the top F♯ of the left hand's F♯ major stays on the pattern's 4, as no
    // finger reaches it without crossing the thumb.
    const c = suggestFingering({ hand: 'right', notes: upAndDown(up(60, [0, 2, 4, 5, 7, 9, 11, 12])) }).fingers
    expect(c[7]).toBe(5)
    const fSharp = suggestFingering({ hand: 'left', notes: upAndDown(up(54, [0, 2, 4, 5, 7, 9, 11, 12])) }).fingers
    expect(fSharp[7]).toBe(4)
  })

  it('keeps the thumb off black keys even where a short run would allow it', () => {
    // One octave of F♯ major could start on the thumb and cross only once; the printed tables start on 2.
    const notes = upAndDown(up(66, [0, 2, 4, 5, 7, 9, 11, 12]))
    const fingers = suggestFingering({ hand: 'right', notes }).fingers as Finger[]
    expect(fingers[0]).toBe(2)
    notes.forEach((m, i) => {
      if ([1, 3, 6, 8, 10].includes(m % 12)) expect(fingers[i]).not.toBe(1)
    })
  })
})

describe('chromatic scale', () => {
  // Common practice, from memory: 3 on every black key, the thumb on the white keys, and 2 on the
  // second of two neighbouring white keys as the hand goes up (right hand F and C, left hand E and B),
  // one finger per key up and down. The turns and ends may leave it (see the scale runs above).
  const EXPECTED: Record<'right' | 'left', Record<number, Finger>> = {
    right: { 0: 2, 2: 1, 4: 1, 5: 2, 7: 1, 9: 1, 11: 1 },
    left: { 0: 1, 2: 1, 4: 2, 5: 1, 7: 1, 9: 1, 11: 2 },
  }
  const cases = (['right', 'left'] as const).flatMap(hand => [0, 2, 4, 7].map(start => ({ hand, start })))

  it.each(cases)('$hand hand, two octaves from pitch class $start up and down', ({ hand, start }) => {
    const up = Array.from({ length: 25 }, (_, i) => (hand === 'right' ? 60 : 48) + start + i)
    const notes = [...up, ...up.slice(0, -1).reverse()]
    const fingers = suggestFingering({ hand, notes }).fingers as Finger[]
    notes.forEach((m, i) => {
      if (i === 0 || i === 24 || i === notes.length - 1) return
      expect(fingers[i], `note ${i}`).toBe([1, 3, 6, 8, 10].includes(m % 12) ? 3 : EXPECTED[hand][m % 12])
    })
  })
})

describe('suggestFingering', () => {
  it.each<[string, 'right' | 'left', number[], Finger[]]>([
    // Common practice: a five-finger pattern takes one finger per key.
    ['five-finger pattern, right hand', 'right', [60, 62, 64, 65, 67, 65, 64, 62, 60], [1, 2, 3, 4, 5, 4, 3, 2, 1]],
    ['five-finger pattern, left hand', 'left', [48, 50, 52, 53, 55], [5, 4, 3, 2, 1]],
    // Common practice: a repeated key keeps its finger.
    ['repeated notes', 'right', [60, 60, 60, 62], [1, 1, 1, 2]],
  ])('%s', (_, hand, notes, fingers) => {
    expect(suggestFingering({ hand, notes }).fingers).toEqual(fingers)
  })

  it('fingers a root-position triad 1 3 5 in the right hand and 5 3 1 in the left', () => {
    // Common practice; chord fingers are listed low to high in pitch.
    expect(suggestFingering({ hand: 'right', notes: [[60, 64, 67]] }).fingers).toEqual([[1, 3, 5]])
    expect(suggestFingering({ hand: 'left', notes: [[48, 52, 55]] }).fingers).toEqual([[5, 3, 1]])
  })

  it('orders chord fingers by pitch however the chord is written', () => {
    const { fingers } = suggestFingering({ hand: 'right', notes: [[67, 60, 64], [65, 60, 69]] })
    for (const chord of fingers as Finger[][]) expect([...chord].sort()).toEqual(chord)
  })

  it('reports positions, their count and the model cost of its answer', () => {
    const notes = [60, 62, 64, 65, 67, 69, 71, 72]
    const result = suggestFingering({ hand: 'right', notes })
    expect(result.fingers).toEqual([1, 2, 3, 1, 2, 3, 4, 5])
    expect(result.positions).toEqual([3])
    expect(result.positionChanges).toBe(1)
    expect(result.cost).toBeCloseTo(scoreFingering('right', notes, result.fingers).total)
  })

  it('returns an empty answer for an empty line', () => {
    expect(suggestFingering({ hand: 'left', notes: [] })).toEqual({ fingers: [], positions: [], positionChanges: 0, cost: 0 })
  })

  it('gives a small hand a position change where a large one reaches', () => {
    // Broken ninths: 1–5 over 14 semitones is within a large hand's comfortable 13 × 1.15, beyond a small hand's practical 15 × 0.8.
    const notes = [60, 74, 60, 74]
    expect(suggestFingering({ hand: 'right', notes, handSize: 'large' }).positionChanges).toBe(0)
    expect(suggestFingering({ hand: 'right', notes, handSize: 'small' }).positionChanges).toBeGreaterThan(0)
  })
})

describe('repeated shapes', () => {
  // A rising sequence of four-note groups on white keys: C D E C, D E F D, E F G E, ...
  const WHITE = [60, 62, 64, 65, 67, 69, 71, 72, 74, 76, 77]
  const sequence = [0, 1, 2, 3, 4].flatMap(g => [WHITE[g]!, WHITE[g + 1]!, WHITE[g + 2]!, WHITE[g]!])

  it('finds the period of a sequence and none in a plain white-key run', () => {
    expect(sequencePeriod(sequence)).toBe(4)
    expect(sequencePeriod(WHITE)).toBe(0)
  })

  it('fingers every group of the sequence alike', () => {
    const fingers = suggestFingering({ hand: 'right', notes: sequence }).fingers
    const firstGroup = fingers.slice(0, 4)
    for (let g = 1; g < 5; g++) expect(fingers.slice(4 * g, 4 * g + 4)).toEqual(firstGroup)
  })

  it('reads a scale run as one finger per pitch class, but not an arpeggio', () => {
    const up = [60, 62, 64, 65, 67, 69, 71, 72]
    expect(scalePhases([...up, ...up.slice(0, -1).reverse()])).toEqual([0, 1, 2, 3, 4, 5, 6, 0, 6, 5, 4, 3, 2, 1, 0])
    expect(scalePhases([60, 64, 67, 72, 76, 79, 84])).toBeNull()
    // The harmonic minor's augmented second (F to G♯ in A minor) is a step of the scale too.
    expect(scalePhases([57, 59, 60, 62, 64, 65, 68, 69])).toEqual([5, 6, 0, 1, 2, 3, 4, 5])
    // The melodic minor (F♯ and G♯ going up, G and F coming down) has a phase per degree instead.
    expect(scalePhases([57, 59, 60, 62, 64, 66, 68, 69, 67, 65, 64, 62, 60, 59, 57])).toEqual([0, 1, 2, 3, 4, 5, 6, 0, 6, 5, 4, 3, 2, 1, 0])
    // A diminished-seventh arpeggio moves by minor thirds but has only four classes.
    expect(scalePhases([60, 63, 66, 69, 72, 75, 78, 81])).toBeNull()
  })

  it('notices when the black/white pattern changes', () => {
    // C D E C then D E F# D: the second group has a black key where the first has none.
    expect(sequencePeriod([60, 62, 64, 60, 62, 64, 66, 62])).toBe(0)
  })
})
