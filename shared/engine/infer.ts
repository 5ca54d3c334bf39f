// The fingering a student probably used, from what they played: ergonomic prior plus timing and velocity evidence.
//
// The model. A hidden chain over the fingers of each note (second order, so rules over three notes
// apply; chain.ts): the prior is the ergonomic cost of the fingering (Parncutt et al. 1997 and the
// trade's rules, ergonomics.ts, under INFERENCE_WEIGHTS), as probability exp(−cost / TEMPERATURE);
// the evidence is what each move between notes sounded like. Every move a fingering makes is one of
// in position, a crossing (a thumb pass, or a reach beyond the comfortable span), the same finger on
// another key, a repeated key, or a shift; a shift is the hand leaving the keys, either because no
// legato fingering reaches, or because the fingers crept (a finger back on a key another finger held,
// with no crossing between: tripleNoteMoves). Any move may also be a hand lift: the hand leaves the
// keys and lands wherever the next notes want it, at LIFT_POINTS plus the note's own cost; a lift and
// staying on the keys are summed as two ways to the same fingering (withEvidence). The positions
// returned are where the chosen fingering starts a new one, and where a lift was clearly the likelier
// reading of the move (LIFT_MARGIN), even if the hand landed where the fingers would not show it.
//
// The evidence terms, per move: `detached`, a silence before the note beyond the player's own; `late`,
// an onset later than the player's own beat; `connected`, keys overlapping or touching (which rules
// out the same finger and a lift); and for the thumb, a note clearly louder than the rest. Each is a
// soft degree between 0 and 1 and each move kind has its probability of showing it (P_DETACHED,
// P_LATE), so the log-likelihood of a fingering's moves adds to its cost.
//
// The player's own articulation and tempo are learned from the attempt itself (timingOf): every step
// is timed against the running median of the player's ms per beat (the drill's beats where known), so
// silences and delays are shares of the step and read the same at 60 and at 160 bpm; the player's
// usual silence (negative for legato's overlap) is the median over the attempt and their scatter the
// lower side's median absolute deviation, which lifts cannot inflate. A silence counts only beyond
// the larger of a share of the step and three of the player's spreads, so a détaché player's silences
// are no lifts, and the same finger's need for a silence is only evidence for a player who would not
// leave one anyway.
//
// A player keeps one fingering for every group of a drill sequence, so a line whose shape repeats three
// times or more is read with its groups alike where the timing leaves them open (alikePath); and as
// such a drill lifts the hand at every group, the player's own silence is read without those lifts
// (centreAndSpread).
//
// Calibration: our own, against the simulated player in tests/unit/engine/support (player.ts
// documents that model; `npm run bench` prints the recovery figures). The constants below are our
// estimates, marked so; none is a published figure.
import { cheapestPath, optionPosteriors, workArray, WORK_PAIRS, type Lattice } from './chain'
import { costModel, type CostModel } from './costs'
import { PERFORMANCE_WEIGHTS, type RuleWeights } from './ergonomics'
import { fitsComfortably, touchPositionStarts } from './positions'
import { CHORD_WINDOW_MS } from './align'
import { chosenTouches, lineLattice, withOptionPenalty, type LineLattice } from './lattice'
import { sequencePeriod, sharedPattern } from './suggest'
import { pairSpan, MAX_PRAC, MIN_PRAC, type SpanRow } from './spans'
import { toRightHandSpace, type Touch } from './touches'
import type { Finger, Hand, HandSize } from './types'

export interface PerformedNote {
  midi: number
  onMs: number
  offMs: number | null
  velocity: number
  /** The drill beat the note was meant for, when known: the steps it is timed against (otherwise every step is one). */
  beat?: number | null
}
export interface InferResult { fingers: { finger: Finger, confidence: number }[], positions: number[] }

/**
 * Ergonomic points per unit of log-likelihood: a fingering's prior probability is proportional to
 * exp(−cost / TEMPERATURE). At 3, the five points a hand lift costs beyond a thumb-under in a scale
 * are e^1.7 ≈ 5 to 1 a priori, which a clear lift in the timing (a silence and a delay, e^4 and more)
 * overturns and a blurred one does not. Our own calibration, against the simulated player.
 */
const TEMPERATURE = 3

/**
 * The price of lifting the hand to a new position, in ergonomic points: a little more than a thumb
 * passing under (about 4 in a scale), so that where the timing is silent the hand is read as staying
 * on the keys. Our calibration.
 */
const LIFT_POINTS = 6

/**
 * The performance weights, but the same finger on two keys in a row twice as dear (about two leaps):
 * even a détaché player rarely does it in a drill, so without a silence that says so it is not read
 * into the playing (common practice).
 */
const INFERENCE_WEIGHTS: RuleWeights = { ...PERFORMANCE_WEIGHTS, sameFinger: 2 * PERFORMANCE_WEIGHTS.sameFinger }

/** What a move into a note asks of the hand, as far as timing can tell. */
type Move = 'inPosition' | 'crossing' | 'shift' | 'sameFinger' | 'repeat'

/**
 * Probability that a move of each kind shows a silence beyond the player's own articulation, and a
 * late onset. Our estimates, from memory of how students play (no published figures): fingers over
 * their keys keep the player's articulation and beat; a thumb passing under keeps legato, often with
 * a small delay; a hand lift needs time in the air and usually costs time. For the same finger the
 * silence depends on the player (SAME_FINGER_RELEASE).
 */
const P_DETACHED: Readonly<Record<Move, number>> = { inPosition: 0.02, crossing: 0.2, shift: 0.9, sameFinger: 0.9, repeat: 0.5 }
const P_LATE: Readonly<Record<Move, number>> = { inPosition: 0.03, crossing: 0.4, shift: 0.6, sameFinger: 0.35, repeat: 0.3 }
/**
 * The same finger must leave one key before it presses the next: a silence of about a tenth of the
 * step (from memory; our estimate). A player whose own articulation already leaves that much shows
 * nothing more, so only the share of the silence the player would not leave anyway is evidence.
 */
const SAME_FINGER_RELEASE = 0.12
const P_DETACHED_SAME_FINGER_ANYWAY = 0.15
/** One finger cannot hold a key and press another, nor a hand leave the keys it holds: overlapping or touching notes almost rule both out. */
const P_CONNECTED_SAME_FINGER = 0.02
/** A heavy thumb: how often a note stands out in loudness when the thumb plays it, and otherwise. */
const P_ACCENT_THUMB = 0.35
const P_ACCENT_OTHER = 0.12
/** MIDI velocity above the player's mean from which a note counts as accented: about a step between dynamics (from memory). */
const ACCENT_VELOCITY = 10

/**
 * A silence counts as detached when it exceeds the player's median by this share of the step or by
 * SPREADS of the player's own spreads, whichever is more, with a soft edge half a spread wide;
 * lateness likewise. A spread is 1.4826 times the median absolute deviation (the usual robust estimate
 * of a standard deviation), so a lift stands out from a player's scatter however loose their playing
 * is, and a steady player's small hesitation does not count. The floors are our calibration against
 * the simulated player.
 */
const DETACHED_SHARE = 0.12
const LATE_SHARE = 0.07
const SPREADS = 3
const MAD_TO_SD = 1.4826
/** The softness of both edges, at least: below this a single jitter would flip the reading. */
const DETACHED_EDGE = 0.025
const LATE_EDGE = 0.02
/** A release this close to the next press (or overlapping it) counts as connected: no finger lifts off and on in less. */
const CONNECTED_MS = 20
/** Steps to each side over which the player's local beat is taken (a running median, so that a lift or a drift in tempo does not move it). */
const BEAT_WINDOW = 4

const logistic = (x: number): number => 1 / (1 + Math.exp(-x))
const finite = (v: number | null | undefined, fallback: number): number => (typeof v === 'number' && Number.isFinite(v) ? v : fallback)

/** log P(observation) where the observation is "true" with soft degree `x` and the model says `p`. */
const softLog = (x: number, p: number): number => Math.log(x * p + (1 - x) * (1 - p))

/**
 * The notes grouped into items (a chord, or a single note), in columns rather than an object per item:
 * a long attempt would otherwise keep hundreds of thousands of small objects alive through the whole
 * inference, which the garbage collector copies again and again. Item i holds notes start[i] to
 * start[i + 1] − 1 (a chord's notes follow each other in the input); NaN stands for an unknown release
 * or beat.
 */
interface Items {
  count: number
  start: Int32Array
  onMs: Float64Array
  releaseMs: Float64Array
  beat: Float64Array
}

function groupChords(notes: PerformedNote[]): Items {
  const start = new Int32Array(notes.length + 1)
  const onMs = new Float64Array(notes.length)
  const beat = new Float64Array(notes.length)
  let count = 0
  for (let i = 0; i < notes.length; i++) {
    const on = finite(notes[i]!.onMs, 0)
    if (count > 0 && on - onMs[count - 1]! <= CHORD_WINDOW_MS) continue
    start[count] = i
    onMs[count] = on
    const b = notes[i]!.beat
    beat[count] = typeof b === 'number' && Number.isFinite(b) ? b : NaN
    count++
  }
  start[count] = notes.length
  const releaseMs = new Float64Array(count)
  for (let item = 0; item < count; item++) {
    // The chord is released when its last note is, and unknown when any note's release is.
    let release = -Infinity
    for (let i = start[item]!; i < start[item + 1]!; i++) {
      const off = notes[i]!.offMs
      if (typeof off !== 'number' || !Number.isFinite(off)) {
        release = NaN
        break
      }
      release = Math.max(release, off)
    }
    releaseMs[item] = release
  }
  return { count, start, onMs, releaseMs, beat }
}

function moveOf(table: SpanRow[][], from: Touch[], to: Touch[]): Move {
  if (from.length === to.length && to.every(t => from.some(h => h.k === t.k))) return 'repeat'
  if (to.some(t => from.some(h => h.f === t.f && h.k !== t.k))) return 'sameFinger'
  if (from.length === 1 && to.length === 1) {
    const a = from[0]!
    const b = to[0]!
    const { row, s } = pairSpan(table, a.f, a.k, b.f, b.k)
    if (s < row[MIN_PRAC] || s > row[MAX_PRAC]) return 'shift'
    // A pass of the thumb, or a reach beyond the comfortable span: the hand may stay on the keys, with a small delay.
    if ((a.f === 1 || b.f === 1) && s < 0) return 'crossing'
    if (!fitsComfortably(table, a, b)) return 'crossing'
  }
  return to.every(t => from.every(h => fitsComfortably(table, h, t))) ? 'inPosition' : 'shift'
}

const MOVES: readonly Move[] = ['inPosition', 'crossing', 'shift', 'sameFinger', 'repeat']
const FINGERS: readonly Finger[] = [1, 2, 3, 4, 5]

/** Beyond this many semitones no finger pair of any hand size reaches, so every larger interval moves alike. */
const FARTHEST_MOVE = 64

const singleMoves = new WeakMap<SpanRow[][], (Uint8Array | undefined)[]>()

/**
 * The move (index into MOVES) between two single notes at [(fa − 1) · 5 + fb − 1]. It depends only on
 * the interval, so each span table keeps one small table per interval instead of judging every pair of
 * every attempt again.
 */
function singleNoteMoves(table: SpanRow[][], interval: number): Uint8Array {
  let byInterval = singleMoves.get(table)
  if (!byInterval) {
    byInterval = new Array(2 * FARTHEST_MOVE + 1)
    singleMoves.set(table, byInterval)
  }
  const d = Math.max(-FARTHEST_MOVE, Math.min(FARTHEST_MOVE, interval))
  let moves = byInterval[d + FARTHEST_MOVE]
  if (!moves) {
    moves = new Uint8Array(25)
    for (const fa of FINGERS) {
      for (const fb of FINGERS) moves[(fa - 1) * 5 + fb - 1] = MOVES.indexOf(moveOf(table, [{ f: fa, k: 0 }], [{ f: fb, k: d }]))
    }
    byInterval[d + FARTHEST_MOVE] = moves
  }
  return moves
}

/** The move (index into MOVES) over three single notes at [((fa − 1) · 5 + fb − 1) · 5 + fc − 1], for intervals d1 then d2. */
const tripleMoveTables = new WeakMap<SpanRow[][], (Uint8Array | undefined)[]>()

const IN_POSITION = MOVES.indexOf('inPosition')
const SHIFT = MOVES.indexOf('shift')

/**
 * The move into the third of three single notes. A pair alone cannot see a hand that crept along: the
 * thumb on C, 2 on E, then the thumb on D is an easy pair (1 under 2) but a new hand position, since
 * the thumb left C without a crossing (common practice: a drill marks it as a position change). So a
 * move that fits the note before it is a shift when the note before that was in the same position and
 * does not fit with it; after a crossing or a shift the hand is new, and only the pair counts.
 */
function tripleNoteMoves(table: SpanRow[][], d1: number, d2: number): Uint8Array {
  let byIntervals = tripleMoveTables.get(table)
  if (!byIntervals) {
    byIntervals = new Array((2 * FARTHEST_MOVE + 1) ** 2)
    tripleMoveTables.set(table, byIntervals)
  }
  const a = Math.max(-FARTHEST_MOVE, Math.min(FARTHEST_MOVE, d1))
  const b = Math.max(-FARTHEST_MOVE, Math.min(FARTHEST_MOVE, d2))
  const slot = (a + FARTHEST_MOVE) * (2 * FARTHEST_MOVE + 1) + b + FARTHEST_MOVE
  let moves = byIntervals[slot]
  if (!moves) {
    moves = new Uint8Array(125)
    const first = singleNoteMoves(table, a)
    const second = singleNoteMoves(table, b)
    for (const fa of FINGERS) {
      for (const fb of FINGERS) {
        for (const fc of FINGERS) {
          let move = second[(fb - 1) * 5 + fc - 1]!
          if (move === IN_POSITION && first[(fa - 1) * 5 + fb - 1] === IN_POSITION && !fitsComfortably(table, { f: fa, k: 0 }, { f: fc, k: a + b })) move = SHIFT
          moves[((fa - 1) * 5 + fb - 1) * 5 + fc - 1] = move
        }
      }
    }
    byIntervals[slot] = moves
  }
  return moves
}

/**
 * The timing of the move into each item, each reading a soft degree between 0 and 1 (NaN where
 * unknown), one column per reading (see Items for why not an object per item).
 */
interface Timings { detached: Float64Array, connected: Float64Array, late: Float64Array }

/** The median of `values[from, to)` without disturbing them, through `scratch`. */
function medianOf(values: Float64Array, from: number, to: number, scratch: Float64Array): number | null {
  // A window of a few values: sorting by insertion beats any selection.
  let count = 0
  for (let j = from; j < to; j++) {
    const v = values[j]!
    if (!Number.isFinite(v)) continue
    let k = count++
    while (k > 0 && scratch[k - 1]! > v) {
      scratch[k] = scratch[k - 1]!
      k--
    }
    scratch[k] = v
  }
  if (count === 0) return null
  const mid = count >> 1
  return count % 2 ? scratch[mid]! : (scratch[mid - 1]! + scratch[mid]!) / 2
}

/**
 * A robust centre and spread of the finite values: their median, and 1.4826 times the median distance
 * below it of the values below it. Lifts only ever add silence and delay, so the spread is read from
 * the lower side, which they cannot widen however many there are. They do move the median, though:
 * where a drill lifts the hand at every group of a sequence, a third of the moves or more are lifts,
 * and the median sits in the upper part of the player's own scatter, so the lower side looks wider
 * than it is and a lift hardly stands out. So, given `share`, the values beyond the edge a lift is read
 * from (`share` of the step or SPREADS spreads above the centre) are set aside and the centre and
 * spread read again from the rest, until no more are set aside; only where two or more stand apart
 * from the rest by two spreads (a cluster of lifts, not the tail of the player's own scatter), and
 * never more than half of them, as lifts are the exception. Our rule, checked against the simulated
 * player on seeds, tempos and sequences the tests do not hold.
 */
function centreAndSpread(values: Float64Array, share = Infinity): { centre: number, spread: number } | null {
  let count = 0
  const finiteValues = new Float64Array(values.length)
  for (const v of values) if (Number.isFinite(v)) finiteValues[count++] = v
  if (count === 0) return null
  const sorted = finiteValues.subarray(0, count).sort()
  const below = new Float64Array(count >> 1)
  let kept = count
  for (;;) {
    const centre = sortedMedian(sorted.subarray(0, kept))
    const half = kept >> 1
    for (let j = 0; j < half; j++) below[j] = centre - sorted[j]!
    const spread = half === 0 ? 0 : MAD_TO_SD * sortedMedian(below.subarray(0, half).sort())
    const limit = centre + Math.max(share, SPREADS * spread)
    let within = kept
    while (within > 0 && sorted[within - 1]! > limit) within--
    if (within === kept || within < (count + 1) >> 1 || kept - within < 2 || sorted[within]! - sorted[within - 1]! < 2 * spread) return { centre, spread }
    kept = within
  }
}

function sortedMedian(sorted: Float64Array): number {
  const mid = sorted.length >> 1
  return sorted.length % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2
}

/**
 * The player's own articulation and beat, learned from the attempt, and each move's timing measured
 * against them. Every step is timed against the player's local beat (the running median of their ms
 * per beat over the neighbouring steps, beats from the drill where known), so a step's lateness and
 * silence are shares of the step and mean the same at 60 and at 160 bpm. The player's usual silence
 * (negative for legato's overlap) and the scatter of both are medians over the attempt, so a lift is
 * read against the player's own articulation, legato or détaché.
 */
function timingOf(items: Items): { timings: Timings, sameFingerDetached: number } {
  const n = items.count
  const withBeats = !items.beat.subarray(0, n).some(Number.isNaN)
  // Ms per beat of the step into each item (NaN where unknown), then the step each item was due.
  const rate = new Float64Array(n).fill(NaN)
  const span = new Float64Array(n).fill(NaN)
  for (let i = 1; i < n; i++) {
    const beats = withBeats ? items.beat[i]! - items.beat[i - 1]! : 1
    const ioi = items.onMs[i]! - items.onMs[i - 1]!
    if (beats > 0 && ioi > 0) {
      span[i] = beats
      rate[i] = ioi / beats
    }
  }
  const scratch = new Float64Array(2 * BEAT_WINDOW + 1)
  const gaps = new Float64Array(n).fill(NaN)
  const lateness = new Float64Array(n).fill(NaN)
  for (let i = 1; i < n; i++) {
    const local = medianOf(rate, Math.max(1, i - BEAT_WINDOW), Math.min(n, i + BEAT_WINDOW + 1), scratch)
    if (local === null || !(local > 0) || !Number.isFinite(span[i]!)) continue
    const due = local * span[i]!
    lateness[i] = (items.onMs[i]! - items.onMs[i - 1]!) / due - 1
    // NaN where the release is unknown, as the gap is then.
    gaps[i] = gapBefore(items, i) / due
  }
  const gapUsual = centreAndSpread(gaps, DETACHED_SHARE)
  // Lateness is read whole: a step's lateness shares its jitter with the next (an early note makes the
  // next step long), so on a few notes its upper side is scatter, not a cluster of lifts to set aside.
  const lateUsual = centreAndSpread(lateness)
  const timings: Timings = { detached: new Float64Array(n).fill(NaN), connected: new Float64Array(n).fill(NaN), late: new Float64Array(n).fill(NaN) }
  for (let i = 0; i < n; i++) {
    const gapMs = i > 0 ? gapBefore(items, i) : NaN
    const gap = gaps[i]!
    const late = lateness[i]!
    if (gapUsual !== null && Number.isFinite(gap)) timings.detached[i] = edge(gap - gapUsual.centre, DETACHED_SHARE, gapUsual.spread, DETACHED_EDGE)
    if (!Number.isNaN(gapMs)) timings.connected[i] = logistic((CONNECTED_MS - gapMs) / 5)
    if (lateUsual !== null && Number.isFinite(late)) timings.late[i] = edge(late - lateUsual.centre, LATE_SHARE, lateUsual.spread, LATE_EDGE)
  }
  // A player who leaves less than the same finger's silence anyway shows it when one finger moves.
  const needsGap = gapUsual === null ? 1 : logistic((SAME_FINGER_RELEASE - gapUsual.centre) / DETACHED_EDGE)
  return { timings, sameFingerDetached: P_DETACHED_SAME_FINGER_ANYWAY + (P_DETACHED.sameFinger - P_DETACHED_SAME_FINGER_ANYWAY) * needsGap }
}

/** How far `excess` is beyond the larger of `share` and SPREADS spreads, as a soft degree. */
function edge(excess: number, share: number, spread: number, softest: number): number {
  return logistic((excess - Math.max(share, SPREADS * spread)) / Math.max(softest, spread / 2))
}

/** The silence between item i − 1's release and item i's onset, or NaN where that release is unknown. */
function gapBefore(items: Items, i: number): number {
  return items.onMs[i]! - items.releaseMs[i - 1]!
}

function accentsOf(notes: PerformedNote[]): number[] {
  const v = notes.map(n => finite(n.velocity, 64))
  const mean = v.reduce((a, b) => a + b, 0) / Math.max(1, v.length)
  const sd = Math.sqrt(v.reduce((a, b) => a + (b - mean) ** 2, 0) / Math.max(1, v.length))
  // With (almost) no spread in loudness there is nothing to learn about a heavy thumb; and a note only
  // stands out when it is clearly louder than the player's scatter, by ACCENT_VELOCITY at least.
  return v.map(x => (sd < 1 ? 0.5 : logistic((x - mean - Math.max(ACCENT_VELOCITY, sd / 2)) / Math.max(2, sd / 4))))
}

/** The move probabilities in MOVES order, so that an item's moves are costed by index. */
const DETACHED_BY_MOVE = MOVES.map(move => P_DETACHED[move])
const LATE_BY_MOVE = MOVES.map(move => P_LATE[move])
const SAME_FINGER = MOVES.indexOf('sameFinger')

/**
 * Each move's timing evidence for one item, in cost units (−TEMPERATURE · log-likelihood), in MOVES
 * order, from its three readings (NaN where unknown).
 */
function moveCosts(detached: number, late: number, connected: number, sameFingerDetached: number, out: Float64Array): void {
  for (let m = 0; m < MOVES.length; m++) {
    let ll = 0
    if (!Number.isNaN(detached)) ll += softLog(detached, m === SAME_FINGER ? sameFingerDetached : DETACHED_BY_MOVE[m]!)
    if (!Number.isNaN(late)) ll += softLog(late, LATE_BY_MOVE[m]!)
    if (!Number.isNaN(connected) && (m === SAME_FINGER || m === SHIFT)) ll += Math.log(connected * P_CONNECTED_SAME_FINGER + (1 - connected))
    out[m] = -TEMPERATURE * ll
  }
}

/**
 * Per option of item i: the velocity evidence, in cost units (−TEMPERATURE · log-likelihood), written
 * to `out` (one scratch array for every item, so that no item allocates).
 */
function thumbEvidence(base: LineLattice, items: Items, i: number, noteKeys: number[], accents: number[], out: Float64Array): void {
  const keys = base.keys[i]!
  const options = base.options[i]!
  out.fill(0, 0, options.length)
  for (let j = 0; j < keys.length; j++) {
    // Every key comes from one of the item's notes, so each gets the loudest of its notes; its
    // log-likelihood under the thumb and under another finger is taken once for all options.
    let accent = -Infinity
    for (let n = items.start[i]!; n < items.start[i + 1]!; n++) if (noteKeys[n] === keys[j]) accent = Math.max(accent, accents[n]!)
    const thumb = softLog(accent, P_ACCENT_THUMB)
    const other = softLog(accent, P_ACCENT_OTHER)
    for (let o = 0; o < options.length; o++) out[o] = out[o]! + (options[o]![j] === 1 ? thumb : other)
  }
  for (let o = 0; o < options.length; o++) out[o] = -TEMPERATURE * out[o]!
}

/**
 * The ergonomic lattice with the evidence added to each option, in cost units. Every table is built
 * once here, since the search and both passes of the posteriors read each of them. Between two single
 * notes the move is one of two: the hand stays on the keys (the pair's ergonomic cost plus the timing's
 * evidence for the move that fingering makes), or it lifts (LIFT_POINTS plus the note's own cost,
 * whatever the fingers before, plus the timing's evidence for a lift); the two are summed as
 * probabilities. A lifted hand is free, so after a clear lift the notes that follow choose the fingers.
 *
 * Over three single notes a fingering may creep (see tripleNoteMoves), a shift the pair cannot see.
 * Where neither this move nor the one before may well be a lift, which is most moves, a creep is
 * simply as dear as a shift heard in plain timing (CREEP_POINTS) and the triple tables stay shared;
 * around a likely lift the item gets a triple table of its own: the creep read from its timing, and
 * the rules over three notes weighed by the chance that the hand stayed on the keys before.
 */
function withEvidence(base: LineLattice, model: CostModel, items: Items, noteKeys: number[], accents: number[]): EvidenceLattice {
  const { timings, sameFingerDetached } = timingOf(items)
  let most = 0
  for (let i = 0; i < items.count; i++) most = Math.max(most, base.sizes[i]!)
  const velocity = new Float64Array(most)
  const baseFirst = base.first()
  thumbEvidence(base, items, 0, noteKeys, accents, velocity)
  // Filled in a loop: copying through the typed-array constructor costs more than the sums.
  const first = new Float64Array(base.sizes[0]!)
  for (let o = 0; o < first.length; o++) first[o] = baseFirst[o]! + velocity[o]!
  // Every item's pair table lives in one buffer, at offsets[i]: a typed array per item, even a view,
  // is an object the garbage collector keeps copying while the inference runs.
  const single = (i: number): boolean => base.keys[i]!.length === 1
  const offsets = new Int32Array(items.count + 1)
  for (let i = 1; i < items.count; i++) offsets[i + 1] = offsets[i]! + base.sizes[i - 1]! * base.sizes[i]!
  // Reused from the last inference: pairCosts writes every entry before anything reads it.
  const buffer = workArray(WORK_PAIRS, offsets[items.count]!)
  // Per pair entry, whether the hand more probably lifted than stayed on the keys.
  const liftFlags = new Uint8Array(buffer.length)
  const triples: (ArrayLike<number> | null)[] = new Array(items.count).fill(null)
  const moveCost = new Float64Array(MOVES.length)
  const lifted = new Float64Array(5)
  // The chance that the move into the item before was a lift, judged from its timing alone.
  let liftBefore = 0
  // The same, as the timing alone tells it (even odds before): how far the note before that still says where the hand is.
  let heardBefore = 0
  for (let i = 1; i < items.count; i++) {
    thumbEvidence(base, items, i, noteKeys, accents, velocity)
    moveCosts(timings.detached[i]!, timings.late[i]!, timings.connected[i]!, sameFingerDetached, moveCost)
    const pairOfSingles = single(i - 1) && single(i)
    if (pairOfSingles) {
      const own = model.first(base.keys[i]![0]!)
      for (let c = 0; c < 5; c++) lifted[c] = LIFT_POINTS + own[c]! + moveCost[SHIFT]!
    }
    pairCosts(base, model.table, i, velocity, moveCost, lifted, buffer, liftFlags, offsets[i]!)
    const lift = liftChance(moveCost)
    if (pairOfSingles && i >= 2 && single(i - 2)) {
      const ka = base.keys[i - 2]![0]!
      const kb = base.keys[i - 1]![0]!
      const d1 = kb - ka
      const d2 = base.keys[i]![0]! - kb
      triples[i] = lift < QUIET && liftBefore < QUIET
        ? creepTriple(model, ka, d1, d2)
        : liftTriple(base.triple(i)!, tripleNoteMoves(model.table, d1, d2), buffer, offsets[i]!, velocity, lifted, 1 - heardBefore)
    }
    liftBefore = lift
    heardBefore = liftChance(moveCost, 0.5)
  }
  // Handed out through one table per size, refilled at each call: the chain reads each pair table
  // before it asks for the next (Lattice), so no item needs a view of its own.
  const tables: Float64Array[] = []
  return {
    sizes: base.sizes,
    first: () => first,
    pair: (i) => {
      const from = offsets[i]!
      const length = offsets[i + 1]! - from
      const table = tables[length] ??= new Float64Array(length)
      for (let j = 0; j < length; j++) table[j] = buffer[from + j]!
      return table
    },
    triple: i => triples[i] ?? base.triple(i),
    lifted: (i, b, c) => liftFlags[offsets[i]! + b * base.sizes[i]! + c] === 1,
  }
}

interface EvidenceLattice extends Lattice {
  /** Whether the move into item i, from option b to option c, was more probably a hand lift. */
  lifted(i: number, b: number, c: number): boolean
}

/**
 * A lift is marked as a position change of its own (where the fingers alone would not show one) only
 * where it is at least one and a half times as likely as the hand staying on the keys: our choice, so
 * that a borderline hesitation is left unmarked.
 */
const LIFT_MARGIN = TEMPERATURE * Math.log(1.5)

/** A move whose timing gives a lift less than this chance is read as the hand staying on the keys. */
const QUIET = 0.02

/** Lifts are rare (our estimate: one move in ten): the chance of one given the move's timing alone. */
const LIFT_PRIOR = 0.1

function liftChance(moveCost: Float64Array, prior = LIFT_PRIOR): number {
  const odds = Math.exp((moveCost[IN_POSITION]! - moveCost[SHIFT]!) / TEMPERATURE) * prior / (1 - prior)
  return odds / (1 + odds)
}

/** −TEMPERATURE · log(e^(−x / TEMPERATURE) + e^(−y / TEMPERATURE)): two ways to the same outcome, as one cost. */
function either(x: number, y: number): number {
  const low = x < y ? x : y
  const apart = (x < y ? y - x : x - y) / TEMPERATURE
  // Beyond nine temperatures apart the dearer way adds less than e^−9 of a temperature.
  return apart > 9 ? low : low - TEMPERATURE * Math.log1p(Math.exp(-apart))
}

/** How much dearer a shift is than a move in position when the timing is plain (no silence, no delay). */
const CREEP_POINTS = (() => {
  const plain = new Float64Array(MOVES.length)
  moveCosts(0, 0, NaN, P_DETACHED.sameFinger, plain)
  return plain[SHIFT]! - plain[IN_POSITION]!
})()

const creepTables = new WeakMap<CostModel, Map<number, Float64Array>>()

const clampMove = (d: number): number => Math.max(-FARTHEST_MOVE, Math.min(FARTHEST_MOVE, d))

/** The model's triple table with CREEP_POINTS on every creeping fingering, shared by every quiet move over the same keys. */
function creepTriple(model: CostModel, ka: number, d1: number, d2: number): Float64Array {
  let tables = creepTables.get(model)
  if (!tables) creepTables.set(model, tables = new Map())
  const key = ((((ka % 12) + 12) % 12) * 257 + clampMove(d1) + 128) * 257 + clampMove(d2) + 128
  let table = tables.get(key)
  if (!table) {
    const baseTriple = model.triple(ka, ka + d1, ka + d1 + d2)
    const moves = tripleNoteMoves(model.table, d1, d2)
    const pairMoves = singleNoteMoves(model.table, d2)
    table = new Float64Array(125)
    for (let j = 0; j < 125; j++) table[j] = baseTriple[j]! + (moves[j] === SHIFT && pairMoves[j % 25] !== SHIFT ? CREEP_POINTS : 0)
    tables.set(key, table)
  }
  return table
}

/**
 * The triple table of a move near a likely lift: the rules over three notes weighed by `held`, the
 * chance the hand stayed on the keys before; and a creeping fingering read as a lift (its pair cost,
 * in `pairs` from `at`, replaced by the lift's) unless the move before was likely a lift itself, after which the
 * note before that says nothing of the hand.
 */
function liftTriple(baseTriple: ArrayLike<number>, moves: Uint8Array, pairs: Float64Array, at: number, velocity: Float64Array, lifted: Float64Array, held: number): Float64Array {
  const costs = new Float64Array(125)
  for (let j = 0; j < 125; j++) {
    const c = j % 5
    costs[j] = held * (baseTriple[j]! + (moves[j] === SHIFT ? velocity[c]! + lifted[c]! - pairs[at + j % 25]! : 0))
  }
  return costs
}

/**
 * Writes item i's pair costs with its velocity and move evidence added to `costs`, and its lift flags,
 * both from `at`. A function of its own, called once per item, so that the engine optimises this work
 * within the first attempt graded.
 */
function pairCosts(base: LineLattice, table: SpanRow[][], i: number, velocity: Float64Array, moveCost: Float64Array, lifted: Float64Array, costs: Float64Array, liftFlags: Uint8Array, at: number): void {
  const basePair = base.pair(i)
  const sb = base.sizes[i - 1]!
  const sc = base.sizes[i]!
  const keysB = base.keys[i - 1]!
  const keysC = base.keys[i]!
  if (keysB.length === 1 && keysC.length === 1) {
    const moves = singleNoteMoves(table, keysC[0]! - keysB[0]!)
    for (let b = 0; b < sb; b++) {
      for (let c = 0; c < sc; c++) {
        const j = b * sc + c
        const move = moves[j]!
        const stay = basePair[j]! + moveCost[move]!
        liftFlags[at + j] = move === SHIFT || lifted[c]! < stay - LIFT_MARGIN ? 1 : 0
        costs[at + j] = velocity[c]! + (move === SHIFT ? lifted[c]! : either(stay, lifted[c]!))
      }
    }
    return
  }
  const from = touchesOf(base, i - 1)
  const to = touchesOf(base, i)
  for (let b = 0; b < sb; b++) {
    for (let c = 0; c < sc; c++) {
      const move = MOVES.indexOf(moveOf(table, from[b]!, to[c]!))
      costs[at + b * sc + c] = basePair[b * sc + c]! + velocity[c]! + moveCost[move]!
    }
  }
}

/** Every option of item i as touches. */
function touchesOf(base: LineLattice, i: number): Touch[][] {
  return base.options[i]!.map(fingers => base.keys[i]!.map((k, j) => ({ f: fingers[j]!, k })))
}

/**
 * Points for each note of a sequence whose finger leaves the fingering most of its groups share. A
 * player keeps one fingering for every group of a sequence (common practice: it is taught so, and the
 * suggestion holds it, suggest.ts), so where the timing of one group leaves its fingers open (a lift
 * heard faintly, a hand that may have crept instead) the other groups decide. About one temperature,
 * a third of the suggestion's rule: a group whose timing clearly says otherwise keeps its own reading.
 * Our calibration.
 */
const SEQUENCE_POINTS = 3

/**
 * Whole groups a line must repeat to be read as a sequence: two are as often a scale's two alike
 * tetrachords (D major's D E F♯ G and A B C♯ D), which no player fingers alike.
 */
const SEQUENCE_GROUPS = 3

/**
 * The cheapest reading, with SEQUENCE_POINTS on every finger of a sequence's note that leaves the
 * finger its place in the group takes most often in the cheapest reading without them. Only lines of
 * single notes whose shape repeats (sequencePeriod) SEQUENCE_GROUPS times or more are sequences. Where
 * the cheapest reading already gives every group the shared fingering, the points change nothing and
 * it stands.
 */
function alikePath(lattice: Lattice, keys: number[][]): number[] {
  const { path } = cheapestPath(lattice)
  if (!keys.every(k => k.length === 1)) return path
  const period = sequencePeriod(keys.map(k => k[0]!))
  if (period === 0 || keys.length < SEQUENCE_GROUPS * period) return path
  const fingers = path.map(o => (o + 1) as Finger)
  const places = fingers.map((_, i) => i % period)
  const pattern = sharedPattern(fingers, places)
  if (fingers.every((finger, i) => finger === pattern.get(places[i]!))) return path
  return cheapestPath(withOptionPenalty(lattice, (i, option) => (option + 1 === pattern.get(places[i]!) ? 0 : SEQUENCE_POINTS))).path
}

export function inferFingering(hand: Hand, notes: PerformedNote[], handSize: HandSize = 'medium'): InferResult {
  if (notes.length === 0) return { fingers: [], positions: [] }
  const items = groupChords(notes)
  const noteKeys = notes.map(n => toRightHandSpace(hand, n.midi))
  const keys: number[][] = new Array(items.count)
  for (let i = 0; i < items.count; i++) {
    const from = items.start[i]!
    const to = items.start[i + 1]!
    // Most items are single notes, which need no set of distinct keys.
    keys[i] = to - from === 1 ? [noteKeys[from]!] : [...new Set(noteKeys.slice(from, to))].sort((a, b) => a - b)
  }
  const model = costModel(handSize, INFERENCE_WEIGHTS)
  const base = lineLattice(keys, model)
  const lattice = withEvidence(base, model, items, noteKeys, accentsOf(notes))
  const path = alikePath(lattice, keys)
  // Confidence is read without the sequence rule: it says how surely the timing and the hand's comfort
  // name a finger, and the rule only chooses among readings they leave open, which makes none surer.
  const posteriors = optionPosteriors(lattice, TEMPERATURE)
  const chosen = chosenTouches(base, path)
  const fingers: { finger: Finger, confidence: number }[] = new Array(notes.length)
  for (let i = 0; i < items.count; i++) {
    const options = base.options[i]!
    const at = posteriors.start[i]!
    for (let n = items.start[i]!; n < items.start[i + 1]!; n++) {
      const j = Math.max(0, base.keys[i]!.indexOf(noteKeys[n]!))
      const finger = chosen[i]![j]!.f
      // A note's confidence is the posterior probability of every assignment that gives it this finger.
      let confidence = 0
      for (let o = 0; o < options.length; o++) if (options[o]![j] === finger) confidence += posteriors.values[at + o]!
      fingers[n] = { finger, confidence: Math.min(1, Math.max(0, confidence)) }
    }
  }
  // A new position begins where the fingering makes one, and wherever the hand was heard to lift
  // (both in item order, so merged as they come).
  const fingered = touchPositionStarts(chosen, model.table)
  const positions: number[] = []
  for (let i = 1, next = 0; i < items.count; i++) {
    const starts = fingered[next] === i
    if (starts) next++
    if (starts || lattice.lifted(i, path[i - 1]!, path[i]!)) positions.push(items.start[i]!)
  }
  return { fingers, positions }
}
