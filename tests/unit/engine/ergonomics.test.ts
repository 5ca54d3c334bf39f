import { describe, expect, it } from 'vitest'
import { scoreFingering, type Rule } from '../../../shared/engine/ergonomics'
import { positionStarts } from '../../../shared/engine/positions'
import { HAND_SIZE_FACTOR, PARNCUTT_SPANS, spanTable, type FingerPair, type SpanRow } from '../../../shared/engine/spans'
import type { Finger } from '../../../shared/engine/types'

// Parncutt, Sloboda, Clarke, Raekallio & Desain 1997, Music Perception 14(4), Table 1, right hand,
// semitones [MinPrac, MinComf, MinRel, MaxRel, MaxComf, MaxPrac]. These rows are a second copy of
// spans.ts, kept as a guard against accidental edits of it, not as an outside check: both were written
// from memory of the published table, and the printed page was not at hand. Each figure was compared
// with four independent public transcriptions of Table 1 in research code (fingering tools, which the
// project does not name); at least three of the four agree with every figure, one giving 1–5 MaxRel 11
// and another 4–5 MaxPrac 6.
const PUBLISHED: [FingerPair, SpanRow][] = [
  ['1-2', [-5, -3, 1, 5, 8, 10]],
  ['1-3', [-4, -2, 3, 7, 10, 12]],
  ['1-4', [-3, -1, 5, 9, 12, 14]],
  ['1-5', [-1, 1, 7, 10, 13, 15]],
  ['2-3', [1, 1, 1, 2, 3, 5]],
  ['2-4', [1, 1, 3, 4, 5, 7]],
  ['2-5', [2, 2, 5, 6, 8, 10]],
  ['3-4', [1, 1, 1, 2, 2, 4]],
  ['3-5', [1, 1, 3, 4, 5, 7]],
  ['4-5', [1, 1, 1, 2, 3, 5]],
]

describe('span table', () => {
  it.each(PUBLISHED)('guards spans.ts against accidental edits: fingers %s as written from memory', (pair, row) => {
    expect(PARNCUTT_SPANS[pair]).toEqual(row)
  })

  it('uses the published values for a medium hand except the relaxed fifth between 1 and 2', () => {
    const table = spanTable('medium')
    // Common practice: a fifth between 1 and 2 is a relaxed stretch.
    expect(table[1]![2]).toEqual([-5, -3, 1, 7, 8, 10])
    expect(table[3]![5]).toEqual(PARNCUTT_SPANS['3-5'])
  })

  it('scales only the reaching columns with hand size', () => {
    const small = spanTable('small')[1]![5]!
    const large = spanTable('large')[1]![5]!
    expect(small[5]).toBeCloseTo(15 * HAND_SIZE_FACTOR.small)
    expect(large[5]).toBeCloseTo(15 * HAND_SIZE_FACTOR.large)
    expect(small[5]).toBeLessThan(large[5])
    // Finger width, not reach, sets the small positive minimums.
    expect(spanTable('large')[2]![3]![0]).toBe(1)
    expect(spanTable('small')[1]![2]![0]).toBeCloseTo(-5 * HAND_SIZE_FACTOR.small)
  })
})

// Each rule on a small right-hand example, points as the paper's Table 2 gives them
// (Parncutt et al. 1997), or as the common-practice rule says; rule text cited in ergonomics.ts.
const RULE_EXAMPLES: [string, number[], Finger[], Rule, number][] = [
  // Rule 1: 2 per semitone beyond MaxComf: 2–3 over a major third is one beyond MaxComf 3.
  ['stretch', [60, 64], [2, 3], 'stretch', 2],
  // Rule 2: 1 per semitone below MinRel with the thumb: 1–3 a semitone apart is 2 below MinRel 3.
  ['small span with thumb', [60, 61], [1, 3], 'smallSpan', 2],
  // Rule 2 without the thumb counts double: 2–4 a semitone apart is 2 below MinRel 3.
  ['small span without thumb', [60, 61], [2, 4], 'smallSpan', 4],
  // Rule 3: 1–3 over a major sixth is 2 above MaxRel 7 (thumb: 1 per semitone).
  ['large span with thumb', [60, 69], [1, 3], 'largeSpan', 2],
  // Rule 3 without the thumb: 2–3 over a major third is 2 above MaxRel 2, 2 per semitone.
  ['large span without thumb', [60, 64], [2, 3], 'largeSpan', 4],
  // Rule 4, full change: thumb in the middle, middle pitch outside, 2–4 a minor sixth apart (MaxPrac 7).
  ['full position change', [64, 60, 72], [2, 1, 4], 'positionChangeCount', 2],
  // Rule 4, half change: thumb in the middle and beyond MaxPrac, but the middle pitch lies inside.
  ['half position change', [64, 66, 72], [2, 1, 4], 'positionChangeCount', 1],
  // Rule 5: 2–4 a minor sixth apart is 3 beyond MaxComf 5.
  ['position change size', [64, 60, 72], [2, 1, 4], 'positionChangeSize', 3],
  // Rule 6: 1 each for 4 and 5.
  ['weak finger', [60, 62, 64, 65, 67], [1, 2, 3, 4, 5], 'weakFinger', 2],
  // Rule 7: 3, 4, 5 in a row.
  ['three-four-five', [60, 62, 64, 65, 67], [1, 2, 3, 4, 5], 'threeFourFive', 1],
  // Rule 8: 3 immediately followed by 4.
  ['three-to-four', [64, 65], [3, 4], 'threeToFour', 1],
  // Rule 9: 3 on white then 4 on black.
  ['four on black', [64, 66], [3, 4], 'fourOnBlack', 1],
  // Rule 10: thumb on black (1) with white keys before and after (2 + 2).
  ['thumb on black', [62, 61, 64], [2, 1, 3], 'thumbOnBlack', 5],
  // Rule 11: 5 on black between white keys, 2 for each.
  ['five on black', [64, 66, 64], [4, 5, 4], 'fiveOnBlack', 4],
  // Rule 12: a pass on one level (white to white).
  ['thumb passing, same level', [64, 65], [3, 1], 'thumbPassing', 1],
  // Rule 12: finger on white below, thumb on black above.
  ['thumb passing onto black', [65, 66], [3, 1], 'thumbPassing', 3],
  // Rule 12: black to white is the easy pass.
  ['thumb passing off black', [70, 72], [4, 1], 'thumbPassing', 0],
  // Common practice: the same finger on two different keys cannot join them legato.
  ['same finger', [60, 62], [2, 2], 'sameFinger', 1],
  // Common practice: passing the thumb under 2 is cramped, under 3 easy, 5 over the thumb a last resort.
  ['crossing with 2', [64, 65], [2, 1], 'crossing', 1],
  ['crossing with 5', [64, 65], [5, 1], 'crossing', 3],
  ['crossing with 3', [64, 65], [3, 1], 'crossing', 0],
  // Common practice: avoid alternating 4 and 5.
  ['four-five alternation', [64, 66, 64], [4, 5, 4], 'fourFiveAlternation', 1],
]

describe('rules', () => {
  it.each(RULE_EXAMPLES)('%s', (_, notes, fingers, rule, points) => {
    expect(scoreFingering('right', notes, fingers).byRule[rule]).toBe(points)
  })

  it('scores the left hand as the mirror image of the right', () => {
    const right = [60, 62, 64, 65, 67, 69, 71, 72]
    const left = right.map(m => 124 - m)
    const fingers: Finger[] = [1, 2, 3, 1, 2, 3, 4, 5]
    expect(scoreFingering('left', left, fingers)).toEqual(scoreFingering('right', right, fingers))
  })

  it('adds the weighted rules up to the total', () => {
    const score = scoreFingering('right', [62, 61, 64], [2, 1, 3])
    // thumbOnBlack counts three times (see LEGATO_WEIGHTS); the 2–3 span D–E is relaxed.
    expect(score.total).toBe(3 * 5)
  })
})

describe('positionStarts', () => {
  it.each<[string, 'right' | 'left', number[], Finger[], number[]]>([
    ['a five-finger pattern stays in one position', 'right', [60, 62, 64, 65, 67], [1, 2, 3, 4, 5], []],
    ['C major, right hand: the thumb under starts a new position', 'right', [60, 62, 64, 65, 67, 69, 71, 72], [1, 2, 3, 1, 2, 3, 4, 5], [3]],
    ['C major, left hand: the crossing 3 starts it', 'left', [48, 50, 52, 53, 55, 57, 59, 60], [5, 4, 3, 2, 1, 3, 2, 1], [5]],
    ['the same finger on a new key moves the hand', 'right', [60, 62, 64], [1, 2, 2], [2]],
    ['a repeated key keeps the position', 'right', [60, 60, 62], [1, 1, 2], []],
  ])('%s', (_, hand, notes, fingers, starts) => {
    expect(positionStarts(hand, notes, fingers)).toEqual(starts)
  })

  it('treats a chord as one placement of the hand', () => {
    expect(positionStarts('right', [[60, 64, 67], [60, 65, 69]], [[1, 3, 5], [1, 4, 5]])).toEqual([1])
    expect(positionStarts('right', [[60, 64, 67], 62], [[1, 3, 5], 2])).toEqual([])
  })

  it('uses a smaller reach for a small hand', () => {
    // 1–5 over a ninth (14 semitones): within MaxPrac 15 for a medium hand, beyond 15 × 0.8 = 12 for a small one
    // (Parncutt et al. 1997, Table 1, from memory; the hand-size factor is our own).
    expect(positionStarts('right', [60, 74], [1, 5], 'medium')).toEqual([])
    expect(positionStarts('right', [60, 74], [1, 5], 'small')).toEqual([1])
  })

  it('holds a stretch the hand reaches without moving as one position, and moves beyond it', () => {
    // A broken triad with its octave is one hand position (common practice): right hand C E G C 1 2 3 5,
    // left hand C E G C 5 4 2 1, and the minor triad A C E 1 2 3, whose 2–3 major third is beyond the
    // comfortable span (3) but within the practical one (5; Parncutt et al. 1997, Table 1, from memory).
    expect(positionStarts('right', [60, 64, 67, 72], [1, 2, 3, 5])).toEqual([])
    expect(positionStarts('left', [48, 52, 55, 60], [5, 4, 2, 1])).toEqual([])
    expect(positionStarts('right', [57, 60, 64], [1, 2, 3])).toEqual([])
    // 2–3 over a fourth (6) is beyond MaxPrac 5: the hand must move.
    expect(positionStarts('right', [60, 62, 68], [1, 2, 3])).toEqual([2])
  })
})
