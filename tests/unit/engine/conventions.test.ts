// Fingering conventions beyond scales: arpeggios, broken chords, seventh chords, trills and sequences.
import { describe, expect, it } from 'vitest'
import { isBlackKey } from '../../../shared/engine/keys'
import { spanTable } from '../../../shared/engine/spans'
import { sequencePeriod, suggestFingering } from '../../../shared/engine/suggest'
import type { Finger, Hand } from '../../../shared/engine/types'
import { HARMONIC_MINOR_SCALE_FINGERINGS, MAJOR_SCALE_FINGERINGS, printedFingers, scaleNotes, type ScaleFingering } from './fixtures/scales'
import { playable, rhKey } from './support/legato'

const f = (s: string): Finger[] => s.split('').map(Number) as Finger[]

/** The chord's notes from `start` up two octaves (and the top root), then back down. */
function arpeggio(chord: number[], start: number): number[] {
  const up = [...Array.from({ length: 2 * chord.length }, (_, i) => start + 12 * Math.floor(i / chord.length) + chord[i % chord.length]!), start + 24 + chord[0]!]
  return [...up, ...up.slice(0, -1).reverse()]
}

/** A fingering for the way up, the same fingers back down. */
const upAndDown = (up: Finger[]): Finger[] => [...up, ...up.slice(0, -1).reverse()]

const MAJOR = [0, 4, 7]
const MINOR = [0, 3, 7]
const FIRST_INVERSION = [4, 7, 12]
const SECOND_INVERSION = [7, 12, 16]
const DOMINANT_SEVENTH = [0, 4, 7, 10]
const DIMINISHED_SEVENTH = [0, 3, 6, 9]

// Arpeggios over two octaves, up and down, each hand: [name, chord, right hand's first note (the left
// hand starts two octaves lower), right-hand fingers up, left-hand fingers up]. Source: common practice,
// from memory, as the usual printed arpeggio fingerings. The white-root majors (C, G, F, D, A, E, B)
// were compared with a music teachers' association's printed scale and arpeggio chart (Bellingham Music
// Teachers Association, "Scale and Arpeggio Fingering Chart for Piano"), which agrees; the rest were not
// checked against a particular book.
// Families: white roots 1 2 3 5 in the right hand (the thumb passes under 3 across the fourth), the
// left hand 5 4 2 1 where the third is white and 5 3 2 1 where it is black (the longer 3 crosses to
// the black key); all-black triads as white-key ones; black roots of major triads 4 1 2 4 / 2 1 4 2; inversions 1 2 4 5 (under 4 across
// the third), the left hand's second inversion 5 3 2 1 (over a fourth); seventh chords 1 2 3 4 /
// 5 4 3 2 1. Among the black-key minors, E♭ minor (all black keys) takes the white-key shape with the
// left hand's 4 (5 4 2 1) and B♭ minor puts the thumbs on F (2 3 1 2 / 3 2 1 3), from memory.
const ARPEGGIOS: [string, number[], number, string, string][] = [
  ['C major', MAJOR, 60, '1231235', '5421421'],
  ['G major', MAJOR, 67, '1231235', '5421421'],
  ['F major', MAJOR, 65, '1231235', '5421421'],
  ['D major', MAJOR, 62, '1231235', '5321321'],
  ['A major', MAJOR, 69, '1231235', '5321321'],
  ['E major', MAJOR, 64, '1231235', '5321321'],
  ['B major', MAJOR, 59, '1231235', '5321321'],
  ['A minor', MINOR, 69, '1231235', '5421421'],
  ['E minor', MINOR, 64, '1231235', '5421421'],
  ['D minor', MINOR, 62, '1231235', '5421421'],
  // Minors whose third is a black key: the left hand's 3 on it where the root is white.
  ['C minor', MINOR, 60, '1231235', '5321321'],
  ['F minor', MINOR, 65, '1231235', '5321321'],
  ['G minor', MINOR, 67, '1231235', '5321321'],
  ['B♭ minor', MINOR, 70, '2312312', '3213213'],
  ['E♭ minor', MINOR, 63, '1231235', '5421421'],
  // All black keys, fingered as a white-key arpeggio (the chart named above prints G♭ major so).
  ['G♭ major', MAJOR, 66, '1231235', '5321321'],
  ['D♭ major', MAJOR, 61, '4124124', '2142142'],
  ['A♭ major', MAJOR, 68, '4124124', '2142142'],
  ['E♭ major', MAJOR, 63, '4124124', '2142142'],
  ['C major, first inversion', FIRST_INVERSION, 60, '1241245', '5421421'],
  ['C major, second inversion', SECOND_INVERSION, 60, '1241245', '5321321'],
  // The right hand's inversions keep 1 2 4 5 where the black key under the top is reached from a white 2.
  ['D major, second inversion', SECOND_INVERSION, 62, '1241245', '5321321'],
  ['G dominant seventh', DOMINANT_SEVENTH, 67, '123412345', '543214321'],
  ['C diminished seventh', DIMINISHED_SEVENTH, 60, '123412345', '543214321'],
]

const ARPEGGIO_CASES = ARPEGGIOS.flatMap(([name, chord, start, right, left]) => (['right', 'left'] as const).map(hand => ({
  name: `${name}, ${hand} hand`,
  hand,
  notes: arpeggio(chord, hand === 'right' ? start : start - 24),
  printed: upAndDown(f(hand === 'right' ? right : left)),
})))

describe('arpeggios over two octaves against the usual fingerings (common practice, from memory)', () => {
  it.each(ARPEGGIO_CASES)('$name', ({ hand, notes, printed }) => {
    expect(suggestFingering({ hand, notes }).fingers).toEqual(printed)
  })

})

// Broken chords within one hand position, fingered as the block chord (common practice, from memory:
// root position 1 3 5 / 5 3 1, first inversion 1 2 5 / 5 3 1, second inversion 1 3 5 / 5 2 1).
const BROKEN_CHORDS: [string, number[], string, string][] = [
  ['C major, root position', [60, 64, 67, 64, 60], '13531', '53135'],
  ['C major, first inversion', [64, 67, 72, 67, 64], '12521', '53135'],
  ['C major, second inversion', [67, 72, 76, 72, 67], '13531', '52125'],
  ['A minor, root position', [57, 60, 64, 60, 57], '13531', '53135'],
  ['G major, first inversion', [71, 74, 79, 74, 71], '12521', '53135'],
  ['F major, second inversion', [60, 65, 69, 65, 60], '13531', '52125'],
  // An Alberti bass, C G E G: the left hand's 5 1 3 1.
  ['an Alberti bass on C major', [48, 55, 52, 55, 48, 55, 52, 55], '15351535', '51315131'],
]

describe('broken chords take the block chord\'s fingers', () => {
  it.each(BROKEN_CHORDS)('%s', (_, notes, right, left) => {
    expect(suggestFingering({ hand: 'right', notes: notes.map(m => m + 12) }).fingers).toEqual(f(right))
    expect(suggestFingering({ hand: 'left', notes: notes.map(m => m - 12) }).fingers).toEqual(f(left))
  })
})

// Trills and alternations: one position, two neighbouring strong fingers (1–2 or 2–3), never 4–5,
// never a thumb crossing inside (common practice).
const TRILLS: [string, Hand, number[], number][] = [
  // The case: E5–F5 alternating at the top of a C major run, right hand.
  ['a trill at the top of a run', 'right', [60, 62, 64, 65, 67, 69, 71, 72, 74, 76, 77, 76, 77, 76, 77, 76, 77], 9],
  ['a trill alone', 'right', [76, 77, 76, 77, 76, 77, 76, 77], 0],
  ['a left-hand trill at the bottom of a run', 'left', [48, 47, 45, 43, 41, 40, 38, 36, 35, 36, 35, 36, 35, 36], 7],
  ['a whole-tone alternation', 'right', [67, 69, 67, 69, 67, 69, 67], 0],
]

describe('trills stay in one position on two neighbouring strong fingers', () => {
  it.each(TRILLS)('%s', (_, hand, notes, from) => {
    const { fingers, positions } = suggestFingering({ hand, notes })
    const trill = fingers.slice(from) as Finger[]
    const pair = [...new Set(trill)].sort()
    expect([[1, 2], [2, 3]]).toContainEqual(pair)
    // One finger per key, so no crossing and no change inside the trill.
    const byKey = new Map<number, Set<Finger>>()
    notes.slice(from).forEach((m, i) => byKey.set(m, new Set([...(byKey.get(m) ?? []), trill[i]!])))
    for (const used of byKey.values()) expect(used.size).toBe(1)
    expect(positions.filter(p => p > from)).toEqual([])
  })
})

// A run into a trill (issue 11, point 3), checked on every major and harmonic minor of the scale table
// (fixtures/scales.ts: common practice, from memory), both hands, up and down, the trill on the two
// scale notes after the run's last, after 9 to 13 notes of the run. Common practice: the run keeps the
// scale's fingering up to the trill (the printed one where the keynote is white; elsewhere the one the
// run has alone, less its last note, which a run alone may end on an edge finger), the trill takes 1–2
// or 2–3, one finger per key, and the hand moves at most once, onto the trill's first note.
const RUN_INTO_TRILL = [...MAJOR_SCALE_FINGERINGS, ...HARMONIC_MINOR_SCALE_FINGERINGS].flatMap(scale =>
  (['right', 'left'] as const).flatMap(hand => (['up', 'down'] as const).map(way => ({ scale, hand, way }))))

/** The scale's two octaves one way (15 notes, up from the bottom or down from the top) with their printed fingers. */
function scaleWay(scale: ScaleFingering, hand: Hand, way: 'up' | 'down'): { line: number[], lineFingers: Finger[] } {
  const notes = scaleNotes(scale, hand === 'left' ? scale.tonic - 12 : scale.tonic, 2)
  const printed = printedFingers(scale, hand, 2)
  return way === 'up'
    ? { line: notes.slice(0, 15), lineFingers: printed.slice(0, 15) }
    : { line: notes.slice(14), lineFingers: printed.slice(14) }
}

const MEDIUM = spanTable('medium')

/** Whether `finger` on `key` goes on legato to the first key `a` of an a–b trill on 1–2 or 2–3 (the lower key on the lower finger). */
function beginsAStrongPair(hand: Hand, finger: Finger, key: number, a: number, b: number): boolean {
  return ([[1, 2], [2, 3]] as const).some(([low, high]) => playable(MEDIUM, finger, rhKey(hand, key), rhKey(hand, a) < rhKey(hand, b) ? low : high, rhKey(hand, a)))
}

describe('a run into a trill keeps the scale\'s fingering; the trill takes a strong pair', () => {
  it.each(RUN_INTO_TRILL.map(c => [`${c.scale.key} ${c.hand} hand ${c.way}`, c] as const))('%s', (_, { scale, hand, way }) => {
    const { line, lineFingers } = scaleWay(scale, hand, way)
    for (let length = 9; length <= 13; length++) {
      const run = line.slice(0, length)
      const [a, b] = [line[length]!, line[length + 1]!]
      const { fingers, positions } = suggestFingering({ hand, notes: [...run, a, b, a, b, a, b, a] })
      const where = `${length} notes then ${a}–${b}: ${fingers.join(' ')}`
      if (!isBlackKey(scale.tonic)) {
        expect(fingers.slice(0, length - 1), where).toEqual(lineFingers.slice(0, length - 1))
        // The run's last note keeps the scale's finger unless that finger can begin neither strong pair
        // legato (it would play the trill's first key too, or cross where no hand crosses): common practice.
        if (fingers[length - 1] !== lineFingers[length - 1]) {
          expect(beginsAStrongPair(hand, lineFingers[length - 1]!, run[length - 1]!, a, b), where).toBe(false)
        }
      }
      else {
        expect(fingers.slice(0, length - 1), where).toEqual(suggestFingering({ hand, notes: run }).fingers.slice(0, length - 1))
      }
      const trill = fingers.slice(length) as Finger[]
      expect(playable(MEDIUM, fingers[length - 1] as Finger, rhKey(hand, run[length - 1]!), trill[0]!, rhKey(hand, a)), where).toBe(true)
      expect([[1, 2], [2, 3]], where).toContainEqual([...new Set(trill)].sort())
      trill.forEach((f, i) => i >= 2 && expect(f, where).toBe(trill[i - 2]))
      expect(positions.filter(p => p > length), where).toEqual([])
    }
  })

  it.each(RUN_INTO_TRILL.map(c => [`${c.scale.key} ${c.hand} hand ${c.way}`, c] as const))('%s, then leaps back (no trill)', (_, { scale, hand, way }) => {
    // The same runs of 9 to 14 notes followed by leaps of a fourth, a sixth and an octave back from
    // their last note: any figure after a run leaves the run's own fingering alone (common practice).
    const { line, lineFingers } = scaleWay(scale, hand, way)
    for (let length = 9; length <= 14; length++) {
      const run = line.slice(0, length)
      const last = run[length - 1]!
      const back = Math.sign(run[0]! - last)
      const { fingers } = suggestFingering({ hand, notes: [...run, last + 5 * back, last + 9 * back, last + 12 * back] })
      const expected = isBlackKey(scale.tonic) ? suggestFingering({ hand, notes: run }).fingers : lineFingers
      expect(fingers.slice(0, length - 1), `${length} notes: ${fingers.join(' ')}`).toEqual(expected.slice(0, length - 1))
    }
  })

  it('fingers the issue\'s C major run to E5 and its E–F trill as a teacher does', () => {
    // Common practice: thumb on C and F through the run, the thumb passing under 2 onto the trill's E,
    // the trill on 1–2 (the line; before 1.12.0 the run put the thumb on B4).
    const notes = [60, 62, 64, 65, 67, 69, 71, 72, 74, 76, 77, 76, 77, 76, 77, 76, 77]
    expect(suggestFingering({ hand: 'right', notes }).fingers).toEqual(f('12312341212121212'))
    // Two octaves up, then the trill D6–C6: the scale's thumb on C6 begins a 1–2 trill, no thumb on B5.
    const twoOctaves = [60, 62, 64, 65, 67, 69, 71, 72, 74, 76, 77, 79, 81, 83, 84, 86, 84, 86, 84, 86, 84, 86]
    expect(suggestFingering({ hand: 'right', notes: twoOctaves }).fingers).toEqual(f('1231234123123412121212'))
    // A trill not at the end: C major up to C5, a D–E trill, then the scale down from C5 as printed
    // (1 4 3 2 1 3 2 1, common practice), the trill on 2–3 from the run's C on the thumb.
    const upTrillDown = [60, 62, 64, 65, 67, 69, 71, 72, 74, 76, 74, 76, 74, 76, 74, 72, 71, 69, 67, 65, 64, 62, 60]
    expect(suggestFingering({ hand: 'right', notes: upTrillDown }).fingers).toEqual(f('12312341' + '2323232' + '14321321'))
  })
})

const WHITE = [48, 50, 52, 53, 55, 57, 59, 60, 62, 64, 65, 67, 69, 71, 72]

// Sequences of white-key groups, both hands, rising and falling: every group the same fingering
// (common practice), the last group included.
const SEQUENCES: [string, number[][]][] = [
  ['four-note groups rising (C D E C, D E F D …)', [0, 1, 2, 3, 4].map(g => [WHITE[g]!, WHITE[g + 1]!, WHITE[g + 2]!, WHITE[g]!])],
  ['four-note groups falling (B A G B, A G F A …)', [6, 5, 4, 3, 2].map(g => [WHITE[g]!, WHITE[g - 1]!, WHITE[g - 2]!, WHITE[g]!])],
  ['three-note groups falling (C B A, B A G …)', [7, 6, 5, 4, 3].map(g => [WHITE[g]!, WHITE[g - 1]!, WHITE[g - 2]!])],
  ['three-note groups rising in thirds (C E D, D F E …)', [0, 1, 2, 3, 4].map(g => [WHITE[g]!, WHITE[g + 2]!, WHITE[g + 1]!])],
]

describe('sequences: one fingering for every group', () => {
  it.each(SEQUENCES.flatMap(([name, groups]) => (['right', 'left'] as const).map(hand => ({ name: `${name}, ${hand} hand`, hand, groups }))))('$name', ({ hand, groups }) => {
    const notes = groups.flat().map(m => (hand === 'right' ? m + 12 : m))
    expect(sequencePeriod(notes)).toBe(groups[0]!.length)
    const fingers = suggestFingering({ hand, notes }).fingers
    const size = groups[0]!.length
    const first = fingers.slice(0, size)
    for (let g = 1; g < groups.length; g++) expect(fingers.slice(g * size, (g + 1) * size), `group ${g + 1}`).toEqual(first)
  })
})
