import { describe, expect, it } from 'vitest'
import { checkFingering, type CheckRule } from '../../../shared/engine/check'
import type { Finger, Hand, LineItem } from '../../../shared/engine/types'
import { HARMONIC_MINOR_SCALE_FINGERINGS, MAJOR_SCALE_FINGERINGS, MELODIC_MINOR_SCALE_FINGERINGS, scaleCase } from './fixtures/scales'

type Row = [string, Hand, LineItem[], (Finger | Finger[])[], CheckRule, number]

// Each awkward spot the check names, on a small example; the source of each rule beside it.
const AWKWARD: Row[] = [
  // Common practice: the printed scale fingerings keep the thumb on white keys (G major with 1 on F♯).
  ['thumb on a black key in a scale', 'right', [67, 69, 71, 72, 74, 76, 78, 79], [1, 2, 3, 1, 2, 3, 1, 2], 'thumbOnBlack', 6],
  // Parncutt et al. 1997 rule 10: the thumb on a black key between two white ones.
  ['thumb on a black key between white ones', 'right', [62, 61, 64], [2, 1, 3], 'thumbOnBlack', 1],
  // Common practice: 4 and 5 are the weakest pair to alternate.
  ['4 and 5 alternating', 'right', [76, 77, 76, 77, 76], [4, 5, 4, 5, 4], 'fourFiveAlternation', 3],
  // Common practice: one finger cannot join two keys legato.
  ['the same finger on two keys in a row', 'right', [60, 62, 64], [1, 2, 2], 'sameFinger', 2],
  // Common practice: only the thumb passes under the hand.
  ['a crossing without the thumb', 'right', [60, 62, 64, 62], [1, 3, 2, 3], 'crossingWithoutThumb', 2],
  // Parncutt et al. 1997 Table 1: 2–3 MaxComf 3, MaxPrac 5, so a major third is a stretch.
  ['a stretch beyond the comfortable span', 'right', [60, 64], [2, 3], 'stretch', 1],
  // Table 1: 1–2 MaxPrac 10, so an octave is beyond reach.
  ['a span beyond the practical span', 'right', [60, 72], [1, 2], 'beyondReach', 1],
  // The left hand mirrors the right: 1–5 over 16 semitones is beyond Table 1's MaxPrac 15.
  ['a left-hand span beyond reach', 'left', [48, 64], [5, 1], 'beyondReach', 1],
  // Common practice: C D E F G in one position with 1 2 3 4 5; 1 2 3 1 2 moves the hand for nothing.
  ['an avoidable position change', 'right', [60, 62, 64, 65, 67], [1, 2, 3, 1, 2], 'avoidablePositionChange', 3],
  // Table 1 for chords: 2–3 over a fifth is beyond MaxPrac 5.
  ['a chord beyond reach', 'right', [[60, 67]], [[2, 3]], 'beyondReach', 0],
]

describe('checkFingering names each awkward spot', () => {
  it.each(AWKWARD)('%s', (_, hand, notes, fingers, rule, index) => {
    const issues = checkFingering({ hand, notes, fingers })
    expect(issues).toContainEqual(expect.objectContaining({ rule, index }))
    expect(issues.find(i => i.rule === rule)!.message.length).toBeGreaterThan(20)
  })
})

// Fingerings nobody would call awkward: the check must stay silent (common practice for each).
const FINE: [string, Hand, LineItem[], (Finger | Finger[])[]][] = [
  ['a five-finger pattern', 'right', [60, 62, 64, 65, 67, 65, 64, 62, 60], [1, 2, 3, 4, 5, 4, 3, 2, 1]],
  ['C major, left hand, one octave', 'left', [48, 50, 52, 53, 55, 57, 59, 60], [5, 4, 3, 2, 1, 3, 2, 1]],
  ['a trill on 2 and 3', 'right', [76, 77, 76, 77, 76, 77], [2, 3, 2, 3, 2, 3]],
  // Common practice, from memory: the root-position C major arpeggio passes the thumb under 3 across a fourth.
  ['the C major arpeggio, right hand', 'right', [60, 64, 67, 72, 76, 79, 84], [1, 2, 3, 1, 2, 3, 5]],
  ['a root-position triad', 'right', [[60, 64, 67]], [[1, 3, 5]]],
  ['repeated keys on one finger', 'right', [67, 67, 67], [3, 3, 3]],
]

describe('checkFingering stays silent where nothing is awkward', () => {
  it.each(FINE)('%s', (_, hand, notes, fingers) => {
    expect(checkFingering({ hand, notes, fingers })).toEqual([])
  })

  it('finds nothing in the printed scale fingerings but the harmonic minor\'s stretch (see fixtures/scales.ts)', () => {
    // Table 1 gives 3–4 a comfortable span of 2 semitones; the printed harmonic minors (right hand)
    // take the augmented second with 3–4 all the same, so that stretch, and only it, is named.
    const flagged: string[] = []
    let stretches = 0
    for (const scale of [...MAJOR_SCALE_FINGERINGS, ...HARMONIC_MINOR_SCALE_FINGERINGS, ...MELODIC_MINOR_SCALE_FINGERINGS]) {
      for (const hand of ['right', 'left'] as const) {
        const { notes, fingers } = scaleCase(scale, hand, 2)
        for (const issue of checkFingering({ hand, notes, fingers })) {
          const step = Math.abs(notes[issue.index]! - notes[issue.index - 1]!)
          if (issue.rule === 'stretch' && step === 3 && scale.steps.includes(8)) stretches++
          else flagged.push(`${scale.key} ${hand}: ${issue.message}`)
        }
      }
    }
    expect(flagged).toEqual([])
    expect(stretches).toBeGreaterThan(0)
  })

  it('forgives one finger on two keys in a line that is not legato', () => {
    expect(checkFingering({ hand: 'right', notes: [60, 62], fingers: [2, 2], legato: false }).map(i => i.rule)).not.toContain('sameFinger')
  })

  it('measures spans by the hand size', () => {
    // Table 1: 1–5 MaxComf 13 for a medium hand; a small one reaches 0.8 of it (spans.ts).
    expect(checkFingering({ hand: 'right', notes: [60, 72], fingers: [1, 5] })).toEqual([])
    expect(checkFingering({ hand: 'right', notes: [60, 72], fingers: [1, 5], handSize: 'small' }).map(i => i.rule)).toContain('stretch')
  })

  it('says where a change could be avoided and how', () => {
    const [issue] = checkFingering({ hand: 'right', notes: [60, 62, 64, 65, 67], fingers: [1, 2, 3, 1, 2] })
    expect(issue!.message).toContain('4 5')
    expect(issue!.message).toContain('notes 4–5')
  })
})
