import { describe, expect, it } from 'vitest'
import { drillNoteHands, suggestHands } from '../../../shared/engine/hands'
import { suggestFingering } from '../../../shared/engine/suggest'
import type { DrillMusic, Hand } from '../../../shared/engine/types'

/** The middle-C split a grand staff falls back on: each hand's line fingered alone, its position changes counted. */
function middleCSplitChanges(notes: number[]): number {
  return (['right', 'left'] as const).reduce((sum, hand) => {
    const mine = notes.filter(m => (hand === 'right' ? m >= 60 : m < 60))
    return sum + (mine.length ? suggestFingering({ hand, notes: mine }).positionChanges : 0)
  }, 0)
}

describe('suggestHands', () => {
  it('shares leaps between the hands so that neither moves (common practice)', () => {
    // C4 and C6 alternating, all above middle C: one hand would leap two octaves at every note.
    const notes = [60, 84, 60, 84, 60, 84, 60, 84]
    const result = suggestHands({ notes })
    expect(result.hands).toEqual(['left', 'right', 'left', 'right', 'left', 'right', 'left', 'right'])
    expect(result.positionChanges).toBe(0)
    expect(middleCSplitChanges(notes)).toBeGreaterThan(0)
  })

  it('takes a high note hand over hand while the other hand keeps its figure (common practice)', () => {
    // A bass C2, then G4 A4 B4 C5 twice with a C7 between: the left hand crosses over for the C7s.
    const notes = [36, 67, 69, 71, 72, 96, 67, 69, 71, 72, 96, 67, 69, 71, 72]
    const result = suggestHands({ notes })
    notes.forEach((m, i) => expect(result.hands[i], `note ${i}`).toBe(m === 36 || m === 96 ? 'left' : 'right'))
    expect(result.positionChanges).toBeLessThan(middleCSplitChanges(notes))
  })

  it.each<[string, number[], Hand]>([
    // Common practice: a five-finger figure belongs to one hand, whichever side of middle C it lies.
    ['right', [72, 74, 76, 77, 79, 77, 76, 74, 72], 'right'],
    ['left', [36, 38, 40, 41, 43, 41, 40, 38, 36], 'left'],
  ])('keeps a five-finger figure in the %s hand', (_, notes, hand) => {
    const result = suggestHands({ notes })
    expect(result.hands.every(h => h === hand)).toBe(true)
    expect(result.positionChanges).toBe(0)
  })

  it('splits a chord that one hand cannot reach, and not one it can (common practice)', () => {
    // C3 C4 E4 G4 C5 spans two octaves; Parncutt et al. 1997 Table 1 gives 1–5 at most 15 semitones.
    const wide = suggestHands({ notes: [[48, 60, 64, 67, 72]] })
    expect(wide.hands[0]).toEqual(['left', 'left', 'right', 'right', 'right'])
    const fingers = wide.fingers[0] as number[]
    expect(fingers[0]).toBe(5)
    expect(fingers[fingers.length - 1]).toBe(5)
    expect(suggestHands({ notes: [[60, 64, 67]] })).toMatchObject({ hands: [['right', 'right', 'right']], fingers: [[1, 3, 5]] })
  })

  it('returns an empty answer for an empty line', () => {
    expect(suggestHands({ notes: [] })).toEqual({ hands: [], fingers: [], positions: [], positionChanges: 0, cost: 0 })
  })
})

describe('drillNoteHands', () => {
  const note = (pitch: string, beat: number, hand?: Hand): DrillMusic['notes'][number] => ({ pitch, beat, length: 1, ...(hand ? { hand } : {}) })

  it('gives the unmarked notes of a both-hands drill the suggested hands, not the middle-C split', () => {
    const drill: DrillMusic = { hand: 'both', tempoBpm: 80, notes: ['C4', 'C6', 'C4', 'C6'].map((p, k) => note(p, k)) }
    expect(drillNoteHands(drill)).toEqual(['left', 'right', 'left', 'right'])
  })

  it('keeps every mark, and the drill\'s own hand for a one-hand drill', () => {
    const marked: DrillMusic = { hand: 'both', tempoBpm: 80, notes: [note('C4', 0, 'right'), note('C6', 1, 'right'), note('C2', 2)] }
    expect(drillNoteHands(marked)).toEqual(['right', 'right', 'left'])
    const left: DrillMusic = { hand: 'left', tempoBpm: 80, notes: [note('C6', 0), note('C7', 1)] }
    expect(drillNoteHands(left)).toEqual(['left', 'left'])
  })
})
