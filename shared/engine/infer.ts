// The fingering a student probably used, from what they played: ergonomic prior plus timing and velocity evidence.
import { cheapestPath, optionPosteriors, type Lattice } from './chain'
import { costModel, fitsPosition, PERFORMANCE_WEIGHTS, positionStarts, type Touch } from './ergonomics'
import { chosenTouches, lineLattice, type LineLattice } from './lattice'
import { pairSpan, MAX_PRAC, MIN_PRAC, spanTable, type SpanRow } from './spans'
import { fingersForItems } from './suggest'
import { toRightHandSpace } from './touches'
import type { Finger, Hand, HandSize, LineItem } from './types'

export interface PerformedNote { midi: number, onMs: number, offMs: number | null, velocity: number }
export interface InferResult { fingers: { finger: Finger, confidence: number }[], positions: number[] }

/** Onsets this close together are one chord (a common threshold for "played together"; our choice). */
const CHORD_WINDOW_MS = 30

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

function median(values: number[]): number | null {
  if (values.length === 0) return null
  const sorted = [...values].sort((a, b) => a - b)
  const mid = sorted.length >> 1
  return sorted.length % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2
}

/** log P(observation) where the observation is "true" with soft degree `x` and the model says `p`. */
const softLog = (x: number, p: number): number => Math.log(x * p + (1 - x) * (1 - p))

interface Item { notes: number[], onMs: number, releaseMs: number | null }

function groupChords(notes: PerformedNote[]): Item[] {
  const items: Item[] = []
  notes.forEach((note, i) => {
    const on = finite(note.onMs, 0)
    const last = items[items.length - 1]
    if (last && on - last.onMs <= CHORD_WINDOW_MS) last.notes.push(i)
    else items.push({ notes: [i], onMs: on, releaseMs: null })
  })
  for (const item of items) {
    const offs = item.notes.map(i => notes[i]!.offMs).filter((v): v is number => typeof v === 'number' && Number.isFinite(v))
    item.releaseMs = offs.length === item.notes.length ? Math.max(...offs) : null
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

interface Timing { detached: number | null, connected: number | null, late: number | null }

function timingOf(items: Item[]): Timing[] {
  const gaps = items.map((item, i) => (i > 0 && items[i - 1]!.releaseMs !== null ? item.onMs - items[i - 1]!.releaseMs! : null))
  const iois = items.map((item, i) => (i > 0 ? item.onMs - items[i - 1]!.onMs : null))
  const usualGap = median(gaps.filter((g): g is number => g !== null))
  const usualIoi = median(iois.filter((v): v is number => v !== null && v > 0))
  return items.map((_, i) => {
    const gap = gaps[i]
    const ioi = iois[i]
    return {
      detached: gap == null || usualGap === null ? null : logistic((gap - usualGap - DETACHED_MS) / 10),
      connected: gap == null ? null : logistic((CONNECTED_MS - gap) / 5),
      late: ioi == null || !usualIoi ? null : logistic((ioi / usualIoi - 1 - LATE_RATIO) / 0.08),
    }
  })
}

function accentsOf(notes: PerformedNote[]): number[] {
  const v = notes.map(n => finite(n.velocity, 64))
  const mean = v.reduce((a, b) => a + b, 0) / Math.max(1, v.length)
  const sd = Math.sqrt(v.reduce((a, b) => a + (b - mean) ** 2, 0) / Math.max(1, v.length))
  // With (almost) no spread in loudness there is nothing to learn about a heavy thumb.
  return v.map(x => (sd < 1 ? 0.5 : logistic(((x - mean) / sd - 0.5) / 0.25)))
}

function moveLogLikelihood(move: Move, t: Timing): number {
  let ll = 0
  if (t.detached !== null) ll += softLog(t.detached, P_DETACHED[move])
  if (t.late !== null) ll += softLog(t.late, P_LATE[move])
  if (t.connected !== null && move === 'sameFinger') ll += Math.log(t.connected * P_CONNECTED_SAME_FINGER + (1 - t.connected))
  return ll
}

/** Per item and option: the velocity evidence, in cost units (−TEMPERATURE · log-likelihood). */
function thumbEvidence(base: LineLattice, items: Item[], noteKeys: number[], accents: number[]): Float64Array[] {
  return base.options.map((options, i) => {
    const accentOfKey = base.keys[i]!.map((k) => {
      const here = items[i]!.notes.filter(n => noteKeys[n] === k).map(n => accents[n]!)
      return here.length > 0 ? Math.max(...here) : 0.5
    })
    return Float64Array.from(options, (fingers) => {
      let ll = 0
      fingers.forEach((f, j) => { ll += softLog(accentOfKey[j]!, f === 1 ? P_ACCENT_THUMB : P_ACCENT_OTHER) })
      return -TEMPERATURE * ll
    })
  })
}

/** The ergonomic lattice with the evidence added to each option, in cost units. */
function withEvidence(base: LineLattice, table: SpanRow[][], items: Item[], velocity: Float64Array[]): Lattice {
  const timings = timingOf(items)
  const touches = (i: number, option: number): Touch[] => base.keys[i]!.map((k, j) => ({ f: base.options[i]![option]![j]!, k }))
  return {
    sizes: base.sizes,
    first: () => Float64Array.from(base.first(), (cost, o) => cost + velocity[0]![o]!),
    pair(i) {
      const costs = Float64Array.from(base.pair(i))
      const sc = base.sizes[i]!
      for (let b = 0; b < base.sizes[i - 1]!; b++) {
        const from = touches(i - 1, b)
        for (let c = 0; c < sc; c++) {
          const move = moveOf(table, from, touches(i, c))
          costs[b * sc + c] = costs[b * sc + c]! + velocity[i]![c]! - TEMPERATURE * moveLogLikelihood(move, timings[i]!)
        }
      }
      return costs
    },
    triple: i => base.triple(i),
  }
}

export function inferFingering(hand: Hand, notes: PerformedNote[], handSize: HandSize = 'medium'): InferResult {
  if (notes.length === 0) return { fingers: [], positions: [] }
  const items = groupChords(notes)
  const noteKeys = notes.map(n => toRightHandSpace(hand, n.midi))
  const keys = items.map(item => [...new Set(item.notes.map(n => noteKeys[n]!))].sort((a, b) => a - b))
  const base = lineLattice(keys, costModel(handSize, PERFORMANCE_WEIGHTS))
  const velocity = thumbEvidence(base, items, noteKeys, accentsOf(notes))
  const lattice = withEvidence(base, spanTable(handSize), items, velocity)
  const { path } = cheapestPath(lattice)
  const posteriors = optionPosteriors(lattice, TEMPERATURE)
  const chosen = chosenTouches(base, path)
  const fingers: { finger: Finger, confidence: number }[] = new Array(notes.length)
  items.forEach((item, i) => {
    item.notes.forEach((n) => {
      const j = Math.max(0, base.keys[i]!.indexOf(noteKeys[n]!))
      const finger = chosen[i]![j]!.f
      // A note's confidence is the posterior probability of every assignment that gives it this finger.
      let confidence = 0
      base.options[i]!.forEach((option, o) => { if (option[j] === finger) confidence += posteriors[i]![o]! })
      fingers[n] = { finger, confidence: Math.min(1, Math.max(0, confidence)) }
    })
  })
  const lineItems: LineItem[] = items.map(item => (item.notes.length === 1 ? notes[item.notes[0]!]!.midi : item.notes.map(n => notes[n]!.midi)))
  const itemFingers = fingersForItems(hand, lineItems, chosen)
  const positions = positionStarts(hand, lineItems, itemFingers, handSize).map(i => items[i]!.notes[0]!)
  return { fingers, positions }
}
