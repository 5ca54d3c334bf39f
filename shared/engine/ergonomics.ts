// The rules of a fingering's cost: Parncutt et al. 1997 rules plus a few rules of the trade, in right-hand space,
// and a fingering scored rule by rule. The precomputed cost model is in costs.ts, hand positions in positions.ts.
import { isBlackKey } from './keys'
import { MAX_COMF, MAX_PRAC, MAX_REL, MIN_COMF, MIN_PRAC, MIN_REL, pairSpan, spanTable, type SpanRow } from './spans'
import { lineTouches, type Touch } from './touches'
import type { Finger, Hand, HandSize, LineItem } from './types'

export type Rule =
  | 'stretch' | 'smallSpan' | 'largeSpan' | 'positionChangeCount' | 'positionChangeSize' | 'weakFinger'
  | 'threeFourFive' | 'threeToFour' | 'fourOnBlack' | 'thumbOnBlack' | 'fiveOnBlack' | 'thumbPassing'
  | 'sameFinger' | 'beyondReach' | 'crossing' | 'fourFiveAlternation' | 'repeatFingerChange' | 'chordShift' | 'chordShape'
  | 'arpeggioPassing'

export type RuleWeights = Readonly<Record<Rule, number>>

/** How a rule hands out its points: the cost model weighs them, scoreFingering keeps them by rule. */
export type Add = (rule: Rule, points: number) => void

const PAPER_RULE_WEIGHT = 1

/**
 * Weights for suggesting a legato fingering. The paper's rules count 1 each (Parncutt et al. 1997
 * add their points unweighted). A move that no finger pair can reach legato, or the same finger on
 * two different keys, is not a fingering for a legato line at all (the paper only scores fingerings
 * within the practical spans; common practice for the same finger): they cost so much that the
 * search takes them only when nothing else exists. Two weights were tuned against the printed
 * scale tables, as noted beside them.
 */
export const LEGATO_WEIGHTS: RuleWeights = {
  stretch: PAPER_RULE_WEIGHT,
  smallSpan: PAPER_RULE_WEIGHT,
  largeSpan: PAPER_RULE_WEIGHT,
  positionChangeCount: PAPER_RULE_WEIGHT,
  positionChangeSize: PAPER_RULE_WEIGHT,
  weakFinger: PAPER_RULE_WEIGHT,
  threeFourFive: PAPER_RULE_WEIGHT,
  threeToFour: PAPER_RULE_WEIGHT,
  fourOnBlack: PAPER_RULE_WEIGHT,
  // Common practice keeps the thumb off black keys in scales (the printed flat-key fingerings exist
  // for that); at the paper's weight the model still puts it there, so this rule counts three times.
  thumbOnBlack: 3 * PAPER_RULE_WEIGHT,
  fiveOnBlack: PAPER_RULE_WEIGHT,
  thumbPassing: PAPER_RULE_WEIGHT,
  sameFinger: 1000,
  beyondReach: 1000,
  // Doubled after checking against the printed scale tables: at 1, a pass under 2 was as cheap as one
  // under 3 and the model kept crossing 2 over the thumb at the top of left-hand flat-key scales.
  crossing: 2,
  fourFiveAlternation: 1,
  repeatFingerChange: 1,
  chordShift: 1,
  chordShape: 1,
  arpeggioPassing: 1,
}

/**
 * Weights for what a student may actually have done: a hand may leave the keys, so a leap or a
 * same-finger move is merely dear (about two thumb-unders), and the timing evidence in infer.ts
 * decides whether it happened.
 */
export const PERFORMANCE_WEIGHTS: RuleWeights = { ...LEGATO_WEIGHTS, sameFinger: 5, beyondReach: 5 }

/**
 * Points for a thumb crossing by the finger it crosses with (common practice: the thumb passes
 * easily under 3 and 4; under 2 it is cramped; 5 over the thumb is a last resort).
 */
const CROSSING_POINTS: Readonly<Record<Finger, number>> = { 1: 0, 2: 1, 3: 0, 4: 0, 5: 3 }

/**
 * MinRel used by the small-span rule when the thumb crosses: the paper's 1–4 value (5) makes a pass
 * under 4 dearer than one under 3 by two points, but common practice treats the two as equally easy
 * (the printed scale tables pass under 4 once an octave), so 4 takes 3's value.
 */
const CROSSING_MIN_REL: Readonly<Record<Finger, number>> = { 1: 0, 2: 3, 3: 3, 4: 3, 5: 7 }

/**
 * The widest thumb passing an arpeggio asks of each finger, in semitones (common practice, from
 * memory: the printed arpeggios pass the thumb under 3 across a fourth in root position, C E G C
 * with 1 2 3 1, and under 4 across a third or a fourth in the inversions, E G C E with 1 2 4 1). The
 * published table puts these beyond the practical span (1–3 MinPrac −4, 1–4 MinPrac −3), because it
 * describes a hand kept in place; in an arpeggio the arm carries the hand over the thumb. So this is
 * a rule of its own, `arpeggioPassing`, beside the published figures rather than an edit of them.
 */
const ARPEGGIO_PASS_SEMITONES: Readonly<Record<Finger, number>> = { 1: 0, 2: 5, 3: 5, 4: 5, 5: 0 }

/** How far the thumb may pass under (or a finger over) it in an arpeggio, by the other finger. */
export function arpeggioPassReach(other: Finger): number {
  return ARPEGGIO_PASS_SEMITONES[other] ?? 0
}

/** Semitones above the thumb of each finger's key in the rest position C D E F G (index = finger). */
const REST_POSITION = [0, 0, 2, 4, 5, 7]

const over = (v: number): number => (v > 0 ? v : 0)

/** Rules about one finger on one key. */
export function noteRules(t: Touch, add: Add): void {
  // Parncutt et al. 1997, rule 6 (weak finger): 1 point each time finger 4 or 5 is used.
  if (t.f === 4 || t.f === 5) add('weakFinger', 1)
  // Parncutt et al. 1997, rule 10 (thumb on black), first part: 1 point whenever the thumb plays a black key.
  if (t.f === 1 && isBlackKey(t.k)) add('thumbOnBlack', 1)
}

/** The span rules for two fingers at once (consecutive notes, or two notes of a chord). */
function spanRules(row: SpanRow, s: number, thumb: boolean, add: Add, minRel = row[MIN_REL]): void {
  // Parncutt et al. 1997, rule 1 (stretch): 2 points per semitone beyond MinComf or MaxComf.
  add('stretch', 2 * (over(row[MIN_COMF] - s) + over(s - row[MAX_COMF])))
  const perSemitone = thumb ? 1 : 2
  // Rule 2 (small span): 1 point per semitone below MinRel with the thumb, 2 without.
  add('smallSpan', perSemitone * over(minRel - s))
  // Rule 3 (large span): 1 point per semitone above MaxRel with the thumb, 2 without.
  add('largeSpan', perSemitone * over(s - row[MAX_REL]))
  if (s < row[MIN_PRAC] || s > row[MAX_PRAC]) add('beyondReach', 1)
}

function colourRules(a: Touch, b: Touch, add: Add): void {
  const blackA = isBlackKey(a.k)
  const blackB = isBlackKey(b.k)
  // Parncutt et al. 1997, rule 10 (thumb on black), second part: 2 more points for a white neighbour on each side.
  if (b.f === 1 && blackB && !blackA) add('thumbOnBlack', 2)
  if (a.f === 1 && blackA && !blackB) add('thumbOnBlack', 2)
  // Rule 11 (five on black): 2 points for each white neighbour of a black key played by 5.
  if (b.f === 5 && blackB && !blackA) add('fiveOnBlack', 2)
  if (a.f === 5 && blackA && !blackB) add('fiveOnBlack', 2)
  // Rule 9 (four on black): 1 point when 3 and 4 follow each other, 3 on white and 4 on black.
  if (a.f === 3 && b.f === 4 && !blackA && blackB) add('fourOnBlack', 1)
  if (a.f === 4 && b.f === 3 && blackA && !blackB) add('fourOnBlack', 1)
}

/** Rules about two consecutive single notes; the second note's own rules are included. */
export function pairRules(table: SpanRow[][], a: Touch, b: Touch, add: Add): void {
  noteRules(b, add)
  colourRules(a, b, add)
  if (a.k === b.k) {
    // Common practice: a repeated key may change finger, but in a drill that is a choice, not a need.
    if (a.f !== b.f) add('repeatFingerChange', 1)
    return
  }
  if (a.f === b.f) {
    // Common practice: one finger cannot hold one key and press the next, so legato is impossible.
    add('sameFinger', 1)
    return
  }
  // Parncutt et al. 1997, rule 8 (three to four): 1 point each time 3 is immediately followed by 4.
  if (a.f === 3 && b.f === 4) add('threeToFour', 1)
  const { row, s } = pairSpan(table, a.f, a.k, b.f, b.k)
  const thumb = a.f === 1 || b.f === 1
  const other = a.f === 1 ? b : a
  if (thumb && s < row[MIN_PRAC] && -s <= arpeggioPassReach(other.f)) {
    // An arpeggio's thumb passing (see ARPEGGIO_PASS_SEMITONES): 1 point per semitone beyond the
    // comfortable crossing, and the ordinary crossing points, instead of a move beyond reach.
    add('arpeggioPassing', row[MIN_COMF] - s)
    add('crossing', CROSSING_POINTS[other.f] ?? 0)
    return
  }
  if (s < row[MIN_PRAC] || s > row[MAX_PRAC]) {
    // Beyond the practical span the hand has to leave the keys, so the legato span rules no longer describe the move.
    add('beyondReach', 1)
    return
  }
  const crossing = thumb && s < 0
  spanRules(row, s, thumb, add, (crossing ? CROSSING_MIN_REL[other.f] : undefined) ?? row[MIN_REL])
  if (crossing) {
    const thumbKey = a.f === 1 ? a.k : b.k
    // Rule 12 (thumb passing): 1 point for a pass on one level (white–white, black–black),
    // 3 points when the finger is on white below and the thumb on black above.
    if (isBlackKey(thumbKey) === isBlackKey(other.k)) add('thumbPassing', 1)
    else if (isBlackKey(thumbKey)) add('thumbPassing', 3)
    add('crossing', CROSSING_POINTS[other.f] ?? 0)
  }
}

/** Rules about three consecutive single notes. */
export function tripleRules(table: SpanRow[][], a: Touch, b: Touch, c: Touch, add: Add): void {
  // Parncutt et al. 1997, rule 7 (three-four-five): 1 point when 3, 4 and 5 follow each other in any order.
  if (a.f !== b.f && b.f !== c.f && a.f !== c.f && a.f + b.f + c.f === 12 && a.f >= 3 && b.f >= 3 && c.f >= 3) {
    add('threeFourFive', 1)
  }
  // Common practice: 4 and 5 are the weakest pair; trilling between them tires the hand.
  if (a.f === c.f && a.f + b.f === 9 && a.f >= 4 && b.f >= 4) add('fourFiveAlternation', 1)
  const { row, s } = pairSpan(table, a.f, a.k, c.f, c.k)
  const outsideComfort = over(row[MIN_COMF] - s) + over(s - row[MAX_COMF])
  if (outsideComfort === 0) return
  // Rule 4 (position-change count), from memory of the paper's wording: when the first and third
  // notes lie outside the comfortable span, a full change (2 points) needs all three of: the middle
  // note played by the thumb, the middle pitch outside the range of the outer two, and the outer
  // two beyond the practical span; a half change (1 point) needs two of the three.
  const conditions = (b.f === 1 ? 1 : 0)
    + (b.k < Math.min(a.k, c.k) || b.k > Math.max(a.k, c.k) ? 1 : 0)
    + (s < row[MIN_PRAC] || s > row[MAX_PRAC] ? 1 : 0)
  if (conditions === 3) add('positionChangeCount', 2)
  else if (conditions === 2) add('positionChangeCount', 1)
  // Rule 5 (position-change size): the semitones by which the outer two lie beyond the comfortable span.
  add('positionChangeSize', outsideComfort)
}

/** Rules inside one chord: every note's own rules and the spans between neighbouring fingers. */
export function chordRules(table: SpanRow[][], touches: Touch[], add: Add): void {
  for (const t of touches) noteRules(t, add)
  for (let i = 1; i < touches.length; i++) {
    const a = touches[i - 1]!
    const b = touches[i]!
    const { row, s } = pairSpan(table, a.f, a.k, b.f, b.k)
    // Our extension of rules 1 to 3 to simultaneous notes.
    spanRules(row, s, a.f === 1, add)
  }
  // Common practice: the hand at rest lies on five neighbouring white keys (C D E F G), so a chord is
  // taken with the fingers that fall on its keys (C–E–G with 1–3–5, not 1–2–4); half a point per
  // semitone that any two of its notes differ from that rest shape.
  for (let i = 0; i < touches.length; i++) {
    for (let j = i + 1; j < touches.length; j++) {
      const a = touches[i]!
      const b = touches[j]!
      add('chordShape', Math.abs(b.k - a.k - (REST_POSITION[b.f]! - REST_POSITION[a.f]!)) / 2)
    }
  }
}

/**
 * Rules between two items when either is a chord (our own extension; the paper covers melodies).
 * Chords are struck, not joined legato, so the hand may move: a finger kept for the next chord costs
 * half a point per semitone it travels, and every pair of different fingers pays the span rules,
 * averaged over the pairs so that big chords do not outweigh small ones.
 */
export function chordTransitionRules(table: SpanRow[][], from: Touch[], to: Touch[], add: Add): void {
  if (from.length === 0 || to.length === 0) return
  const share = 1 / (from.length * to.length)
  const shared: Add = (rule, points) => add(rule, points * share)
  for (const a of from) {
    for (const b of to) {
      if (a.f === b.f) {
        shared('chordShift', Math.abs(b.k - a.k) / 2)
        continue
      }
      const { row, s } = pairSpan(table, a.f, a.k, b.f, b.k)
      const stretch = 2 * (over(row[MIN_COMF] - s) + over(s - row[MAX_COMF]))
      shared('stretch', stretch)
    }
  }
}

// --- Whole fingerings -----------------------------------------------------------------------------

export interface FingeringScore {
  total: number
  byRule: Record<Rule, number>
}

/**
 * Every rule's points for a given fingering of a line, under the given weights (the paper's
 * rules count one each). This is the model the search minimises, evaluated rule by rule.
 */
export function scoreFingering(hand: Hand, items: LineItem[], fingers: (Finger | Finger[])[], handSize: HandSize = 'medium', weights: RuleWeights = LEGATO_WEIGHTS): FingeringScore {
  const table = spanTable(handSize)
  const byRule = Object.fromEntries(Object.keys(weights).map(r => [r, 0])) as Record<Rule, number>
  const add: Add = (rule, points) => { byRule[rule] += points }
  const line = lineTouches(hand, items, fingers)
  line.forEach((touches, i) => {
    const prev = line[i - 1]
    const single = touches.length === 1 && prev?.length === 1
    if (i === 0 || !prev) chordRules(table, touches, add)
    else if (single) pairRules(table, prev[0]!, touches[0]!, add)
    else {
      chordRules(table, touches, add)
      chordTransitionRules(table, prev, touches, add)
    }
    const before = line[i - 2]
    if (single && before?.length === 1) tripleRules(table, before[0]!, prev[0]!, touches[0]!, add)
  })
  let total = 0
  for (const rule of Object.keys(byRule) as Rule[]) total += weights[rule] * byRule[rule]
  return { total, byRule }
}
