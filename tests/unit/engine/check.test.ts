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

  describe('says a span\'s figures without contradicting itself', () => {
    const message = (input: Parameters<typeof checkFingering>[0], rule: CheckRule): string | undefined =>
      checkFingering(input).find(i => i.rule === rule)?.message

    it('names a crossing of 5 and the thumb as one no hand makes comfortably', () => {
      // Parncutt et al. 1997 Table 1 (from memory, spans.ts): 1–5 MinPrac −1, MinComf +1, so the thumb
      // one semitone beyond 5 is reachable but never comfortable; a small hand reaches 0.8 of it (spans.ts).
      expect(message({ hand: 'right', notes: [71, 72], fingers: [5, 1] }, 'stretch')).toBe(
        'Note 1 (B4) to note 2 (C5): the thumb and finger 5 cross, the thumb 1 semitone beyond finger 5: a medium hand reaches that, but no crossing of these two is comfortable.')
      expect(message({ hand: 'right', notes: [71, 72], fingers: [5, 1], handSize: 'small' }, 'beyondReach')).toBe(
        'Note 1 (B4) to note 2 (C5): the thumb and finger 5 cross, the thumb 1 semitone beyond finger 5: a small hand cannot cross these two at all; the hand must leave the keys.')
    })

    it('gives the widest whole span within the limit, not a rounded one', () => {
      // Table 1: 1–5 MaxComf 13, times 1.15 for a large hand (spans.ts) = 14.95; 15 semitones pass it, 14 do not.
      expect(message({ hand: 'right', notes: [60, 75], fingers: [1, 5], handSize: 'large' }, 'stretch')).toBe(
        'Note 1 (C4) to note 2 (D#5): the thumb and finger 5 ask for a span of 15 semitones, more than the 14 a large hand spans comfortably.')
      // Table 1: 1–2 MinPrac −5 (the thumb passing under 2 by a fourth at most); the left hand mirrors it.
      expect(message({ hand: 'left', notes: [64, 56], fingers: [2, 1] }, 'beyondReach')).toBe(
        'Note 1 (E4) to note 2 (G#3): the thumb and finger 2 cross, the thumb 8 semitones beyond finger 2: more than the 5 a medium hand can cross them at all; the hand must leave the keys.')
    })

    it('calls fingers too close what they are, not a reach too far', () => {
      // Table 1: 2–5 MinPrac 2, so 2 and 5 on neighbouring keys are closer than they can play.
      expect(message({ hand: 'right', notes: [[60, 61]], fingers: [[2, 5]] }, 'beyondReach')).toBe(
        'Chord 1 (C4+C#4): finger 2 and finger 5 ask for keys 1 semitone apart, closer than they can play: they need at least 2 semitones between them.')
    })

    it('never sets a span against a limit it does not pass, for any pair, span and hand size', () => {
      // Whatever Table 1 says, a message's own two figures must agree with its verdict.
      const figures = /(\d+) semitones? (?:beyond|apart)|span of (\d+) semitones?/
      let checked = 0
      for (const handSize of ['small', 'medium', 'large'] as const) {
        for (let lo = 1; lo <= 4; lo++) {
          for (let hi = lo + 1; hi <= 5; hi++) {
            for (let span = -14; span <= 24; span++) {
              if (span === 0) continue
              for (const issue of checkFingering({ hand: 'right', notes: [60, 60 + span], fingers: [lo as Finger, hi as Finger], handSize })) {
                if (issue.rule !== 'stretch' && issue.rule !== 'beyondReach') continue
                const said = Number(figures.exec(issue.message)?.slice(1).find(x => x !== undefined))
                expect(said, issue.message).toBe(Math.abs(span))
                const limit = /the (\d+) |at least (\d+) /.exec(issue.message)?.slice(1).find(x => x !== undefined)
                if (limit === undefined) {
                  expect(issue.message).toMatch(/cannot cross these two at all|no crossing of these two is comfortable/)
                  continue
                }
                if (issue.message.includes('at least')) expect(Math.abs(span), issue.message).toBeLessThan(Number(limit))
                else expect(Math.abs(span), issue.message).toBeGreaterThan(Number(limit))
                checked++
              }
            }
          }
        }
      }
      expect(checked).toBeGreaterThan(100)
    })
  })

  it('says where a change could be avoided and how', () => {
    const [issue] = checkFingering({ hand: 'right', notes: [60, 62, 64, 65, 67], fingers: [1, 2, 3, 1, 2] })
    expect(issue!.message).toContain('4 5')
    expect(issue!.message).toContain('notes 4–5')
  })
})
