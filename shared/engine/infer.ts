// The fingering a student probably used, from what they played: ergonomic prior plus timing and velocity evidence.
import { cheapestPath, optionPosteriors, type Lattice } from './chain'
import { costModel } from './costs'
import { PERFORMANCE_WEIGHTS } from './ergonomics'
import { fitsPosition, touchPositionStarts } from './positions'
import { CHORD_WINDOW_MS } from './align'
import { chosenTouches, lineLattice, type LineLattice } from './lattice'
import { pairSpan, MAX_PRAC, MIN_PRAC, type SpanRow } from './spans'
import { median } from './stats'
import { toRightHandSpace, type Touch } from './touches'
import type { Finger, Hand, HandSize } from './types'

export interface PerformedNote { midi: number, onMs: number, offMs: number | null, velocity: number }
export interface InferResult { fingers: { finger: Finger, confidence: number }[], positions: number[] }

/**
 * Ergonomic points per unit of log-likelihood: a fingering's prior probability is proportional to
 * exp(−cost / TEMPERATURE). At 2, a thumb pass (about 8 points) is as unlikely a priori as evidence
 * four times stronger one way than the other can overturn (e^4 ≈ 55). Our own calibration.
 */
const TEMPERATURE = 2

/** What a move between two notes asks of the hand, as far as timing can tell. */
type Move = 'inPosition' | 'crossing' | 'shift' | 'sameFinger' | 'repeat'

/**
 * Probability that a move of each kind shows a gap beyond the player's usual articulation, and a late
 * onset. Our estimates (no published figures): a hand lift needs time in the air; a thumb passing
 * under keeps legato with at most a small delay; the same finger must leave one key before the next.
 */
const P_DETACHED: Readonly<Record<Move, number>> = { inPosition: 0.1, crossing: 0.2, shift: 0.75, sameFinger: 0.9, repeat: 0.9 }
const P_LATE: Readonly<Record<Move, number>> = { inPosition: 0.1, crossing: 0.2, shift: 0.6, sameFinger: 0.5, repeat: 0.2 }
/** One finger cannot hold a key and press another: overlapping or touching notes almost rule it out. */
const P_CONNECTED_SAME_FINGER = 0.02
/** A heavy thumb: how often a note stands out in loudness when the thumb plays it, and otherwise. */
const P_ACCENT_THUMB = 0.35
const P_ACCENT_OTHER = 0.12

/** A gap more than this beyond the player's median gap counts as detached (soft edge of 10 ms). */
const DETACHED_MS = 30
/** A release this close to the next press (or overlapping it) counts as connected. */
const CONNECTED_MS = 20
/** An inter-onset interval this much longer than the median counts as late. */
const LATE_RATIO = 0.25

const logistic = (x: number): number => 1 / (1 + Math.exp(-x))
const finite = (v: number | null | undefined, fallback: number): number => (typeof v === 'number' && Number.isFinite(v) ? v : fallback)

/** log P(observation) where the observation is "true" with soft degree `x` and the model says `p`. */
const softLog = (x: number, p: number): number => Math.log(x * p + (1 - x) * (1 - p))

interface Item { notes: number[], onMs: number, releaseMs: number | null }

function groupChords(notes: PerformedNote[]): Item[] {
  const items: Item[] = []
  for (let i = 0; i < notes.length; i++) {
    const on = finite(notes[i]!.onMs, 0)
    const last = items[items.length - 1]
    if (last && on - last.onMs <= CHORD_WINDOW_MS) last.notes.push(i)
    else items.push({ notes: [i], onMs: on, releaseMs: null })
  }
  for (const item of items) {
    // The chord is released when its last note is, and unknown when any note's release is.
    let release: number | null = -Infinity
    for (const i of item.notes) {
      const off = notes[i]!.offMs
      if (typeof off !== 'number' || !Number.isFinite(off)) {
        release = null
        break
      }
      release = Math.max(release, off)
    }
    item.releaseMs = release
  }
  return items
}

function moveOf(table: SpanRow[][], from: Touch[], to: Touch[]): Move {
  if (from.length === to.length && to.every(t => from.some(h => h.k === t.k))) return 'repeat'
  if (to.some(t => from.some(h => h.f === t.f && h.k !== t.k))) return 'sameFinger'
  if (from.length === 1 && to.length === 1) {
    const a = from[0]!
    const b = to[0]!
    const { row, s } = pairSpan(table, a.f, a.k, b.f, b.k)
    if (s < row[MIN_PRAC] || s > row[MAX_PRAC]) return 'shift'
    if ((a.f === 1 || b.f === 1) && s < 0) return 'crossing'
  }
  return to.every(t => from.every(h => fitsPosition(table, h, t))) ? 'inPosition' : 'shift'
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

interface Timing { detached: number | null, connected: number | null, late: number | null }

function timingOf(items: Item[]): Timing[] {
  const gaps: number[] = []
  const iois: number[] = []
  for (let i = 1; i < items.length; i++) {
    const gap = gapBefore(items, i)
    if (gap !== null) gaps.push(gap)
    const ioi = items[i]!.onMs - items[i - 1]!.onMs
    if (ioi > 0) iois.push(ioi)
  }
  const usualGap = median(gaps)
  const usualIoi = median(iois)
  const timings: Timing[] = new Array(items.length)
  for (let i = 0; i < items.length; i++) {
    const gap = i > 0 ? gapBefore(items, i) : null
    const ioi = i > 0 ? items[i]!.onMs - items[i - 1]!.onMs : null
    timings[i] = {
      detached: gap === null || usualGap === null ? null : logistic((gap - usualGap - DETACHED_MS) / 10),
      connected: gap === null ? null : logistic((CONNECTED_MS - gap) / 5),
      late: ioi === null || !usualIoi ? null : logistic((ioi / usualIoi - 1 - LATE_RATIO) / 0.08),
    }
  }
  return timings
}

/** The silence between item i − 1's release and item i's onset, or null where that release is unknown. */
function gapBefore(items: Item[], i: number): number | null {
  const release = items[i - 1]!.releaseMs
  return release === null ? null : items[i]!.onMs - release
}

function accentsOf(notes: PerformedNote[]): number[] {
  const v = notes.map(n => finite(n.velocity, 64))
  const mean = v.reduce((a, b) => a + b, 0) / Math.max(1, v.length)
  const sd = Math.sqrt(v.reduce((a, b) => a + (b - mean) ** 2, 0) / Math.max(1, v.length))
  // With (almost) no spread in loudness there is nothing to learn about a heavy thumb.
  return v.map(x => (sd < 1 ? 0.5 : logistic(((x - mean) / sd - 0.5) / 0.25)))
}

/** The move probabilities in MOVES order, so that an item's moves are costed by index. */
const DETACHED_BY_MOVE = MOVES.map(move => P_DETACHED[move])
const LATE_BY_MOVE = MOVES.map(move => P_LATE[move])
const SAME_FINGER = MOVES.indexOf('sameFinger')

/** Each move's timing evidence for one item, in cost units (TEMPERATURE · log-likelihood), in MOVES order. */
function moveCosts(t: Timing, out: Float64Array): void {
  for (let m = 0; m < MOVES.length; m++) {
    let ll = 0
    if (t.detached !== null) ll += softLog(t.detached, DETACHED_BY_MOVE[m]!)
    if (t.late !== null) ll += softLog(t.late, LATE_BY_MOVE[m]!)
    if (t.connected !== null && m === SAME_FINGER) ll += Math.log(t.connected * P_CONNECTED_SAME_FINGER + (1 - t.connected))
    out[m] = TEMPERATURE * ll
  }
}

/**
 * Per option of item i: the velocity evidence, in cost units (−TEMPERATURE · log-likelihood), written
 * to `out` (one scratch array for every item, so that no item allocates).
 */
function thumbEvidence(base: LineLattice, item: Item, i: number, noteKeys: number[], accents: number[], out: Float64Array): void {
  const keys = base.keys[i]!
  const options = base.options[i]!
  out.fill(0, 0, options.length)
  for (let j = 0; j < keys.length; j++) {
    // Every key comes from one of the item's notes, so each gets the loudest of its notes; its
    // log-likelihood under the thumb and under another finger is taken once for all options.
    let accent = -Infinity
    for (const n of item.notes) if (noteKeys[n] === keys[j]) accent = Math.max(accent, accents[n]!)
    const thumb = softLog(accent, P_ACCENT_THUMB)
    const other = softLog(accent, P_ACCENT_OTHER)
    for (let o = 0; o < options.length; o++) out[o] = out[o]! + (options[o]![j] === 1 ? thumb : other)
  }
  for (let o = 0; o < options.length; o++) out[o] = -TEMPERATURE * out[o]!
}

/**
 * The ergonomic lattice with the evidence added to each option, in cost units. Every table is built
 * once here, since the search and both passes of the posteriors read each of them.
 */
function withEvidence(base: LineLattice, table: SpanRow[][], items: Item[], noteKeys: number[], accents: number[]): Lattice {
  const timings = timingOf(items)
  let most = 0
  for (let i = 0; i < items.length; i++) most = Math.max(most, base.sizes[i]!)
  const velocity = new Float64Array(most)
  const baseFirst = base.first()
  thumbEvidence(base, items[0]!, 0, noteKeys, accents, velocity)
  // Filled in a loop: copying through the typed-array constructor costs more than the sums.
  const first = new Float64Array(base.sizes[0]!)
  for (let o = 0; o < first.length; o++) first[o] = baseFirst[o]! + velocity[o]!
  // Every item's pair table is a view into one buffer: a typed array of more than a few numbers is
  // allocated outside the heap, which would cost more per item than filling it.
  let size = 0
  for (let i = 1; i < items.length; i++) size += base.sizes[i - 1]! * base.sizes[i]!
  const buffer = new Float64Array(size)
  let offset = 0
  const pairs: Float64Array[] = new Array(items.length)
  const moveCost = new Float64Array(MOVES.length)
  for (let i = 1; i < items.length; i++) {
    thumbEvidence(base, items[i]!, i, noteKeys, accents, velocity)
    moveCosts(timings[i]!, moveCost)
    const costs = buffer.subarray(offset, offset + base.sizes[i - 1]! * base.sizes[i]!)
    offset += costs.length
    pairCosts(base, table, i, velocity, moveCost, costs)
    pairs[i] = costs
  }
  return { sizes: base.sizes, first: () => first, pair: i => pairs[i]!, triple: i => base.triple(i) }
}

/**
 * Writes item i's pair costs with its velocity and move evidence added to `costs`. A function of its
 * own, called once per item, so that the engine optimises this work within the first attempt graded.
 */
function pairCosts(base: LineLattice, table: SpanRow[][], i: number, velocity: Float64Array, moveCost: Float64Array, costs: Float64Array): void {
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
        costs[j] = basePair[j]! + velocity[c]! - moveCost[moves[j]!]!
      }
    }
    return
  }
  const from = touchesOf(base, i - 1)
  const to = touchesOf(base, i)
  for (let b = 0; b < sb; b++) {
    for (let c = 0; c < sc; c++) {
      const move = MOVES.indexOf(moveOf(table, from[b]!, to[c]!))
      costs[b * sc + c] = basePair[b * sc + c]! + velocity[c]! - moveCost[move]!
    }
  }
}

/** Every option of item i as touches. */
function touchesOf(base: LineLattice, i: number): Touch[][] {
  return base.options[i]!.map(fingers => base.keys[i]!.map((k, j) => ({ f: fingers[j]!, k })))
}

export function inferFingering(hand: Hand, notes: PerformedNote[], handSize: HandSize = 'medium'): InferResult {
  if (notes.length === 0) return { fingers: [], positions: [] }
  const items = groupChords(notes)
  const noteKeys = notes.map(n => toRightHandSpace(hand, n.midi))
  // Most items are single notes, which need no set of distinct keys.
  const keys = items.map(item => item.notes.length === 1 ? [noteKeys[item.notes[0]!]!] : [...new Set(item.notes.map(n => noteKeys[n]!))].sort((a, b) => a - b))
  const model = costModel(handSize, PERFORMANCE_WEIGHTS)
  const base = lineLattice(keys, model)
  const lattice = withEvidence(base, model.table, items, noteKeys, accentsOf(notes))
  const { path } = cheapestPath(lattice)
  const posteriors = optionPosteriors(lattice, TEMPERATURE)
  const chosen = chosenTouches(base, path)
  const fingers: { finger: Finger, confidence: number }[] = new Array(notes.length)
  for (let i = 0; i < items.length; i++) {
    const options = base.options[i]!
    const posterior = posteriors[i]!
    for (const n of items[i]!.notes) {
      const j = Math.max(0, base.keys[i]!.indexOf(noteKeys[n]!))
      const finger = chosen[i]![j]!.f
      // A note's confidence is the posterior probability of every assignment that gives it this finger.
      let confidence = 0
      for (let o = 0; o < options.length; o++) if (options[o]![j] === finger) confidence += posterior[o]!
      fingers[n] = { finger, confidence: Math.min(1, Math.max(0, confidence)) }
    }
  }
  const positions = touchPositionStarts(chosen, model.table).map(i => items[i]!.notes[0]!)
  return { fingers, positions }
}
