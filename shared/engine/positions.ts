// Hand positions: where a fingering makes the hand move to a new position.
import { MAX_COMF, MAX_PRAC, MIN_COMF, MIN_PRAC, spanTable, type SpanRow } from './spans'
import { lineTouches, type Touch } from './touches'
import type { Finger, Hand, HandSize, LineItem } from './types'

function fitsBetween(table: SpanRow[][], a: Touch, b: Touch, min: number, max: number): boolean {
  if (a.f === b.f) return a.k === b.k
  // pairSpan written out: this runs for every note of every grade, and its small result object would
  // be garbage each time.
  const lower = a.f < b.f
  const row = lower ? table[a.f]![b.f]! : table[b.f]![a.f]!
  const s = lower ? b.k - a.k : a.k - b.k
  return s > 0 && s >= row[min]! && s <= row[max]!
}

/**
 * Two touches fit one hand position: different fingers in key order within the practical span (the widest
 * the hand stretches without moving, Parncutt et al.'s MaxPrac), or one finger on one key. A stretch beyond
 * the comfortable span is a cost of the fingering, not a new position: a broken triad with its octave
 * (right hand C E G C, 1 2 3 5) is one hand position (common practice).
 */
export function fitsPosition(table: SpanRow[][], a: Touch, b: Touch): boolean {
  return fitsBetween(table, a, b, MIN_PRAC, MAX_PRAC)
}

/** Two touches fit one hand position without a stretch: in key order within the comfortable span. */
export function fitsComfortably(table: SpanRow[][], a: Touch, b: Touch): boolean {
  return fitsBetween(table, a, b, MIN_COMF, MAX_COMF)
}

/**
 * Indices of the items where a new hand position begins for a given fingering (first item not counted).
 * A hand position is the set of touches since the last change; a note starts a new one when it does
 * not fit with every touch of the current one (a crossing, the same finger on another key, or a span
 * beyond the practical range), which is how teachers mark a "new position" in a drill.
 */
export function positionStarts(hand: Hand, items: LineItem[], fingers: (Finger | Finger[])[], handSize: HandSize = 'medium'): number[] {
  return touchPositionStarts(lineTouches(hand, items, fingers), spanTable(handSize))
}

/** positionStarts for a line already given as touches (keys in right-hand space, ascending in each item). */
export function touchPositionStarts(line: Touch[][], table: SpanRow[][]): number[] {
  const starts: number[] = []
  let current: Touch[] = []
  for (let i = 0; i < line.length; i++) {
    const touches = line[i]!
    if (touches.length === 0) continue
    if (fitsAll(table, current, touches)) {
      // A finger that plays again now sits on its new key (which fitting allows only if it is the same key);
      // any other finger joins the position.
      for (const t of touches) {
        let same = 0
        while (same < current.length && current[same]!.f !== t.f) same++
        current[same] = t
      }
      continue
    }
    if (current.length > 0) starts.push(i)
    current = touches.slice()
  }
  return starts
}

/** Whether every touch fits one hand position with every touch held. */
function fitsAll(table: SpanRow[][], held: Touch[], touches: Touch[]): boolean {
  for (const t of touches) {
    for (const h of held) if (!fitsPosition(table, h, t)) return false
  }
  return true
}
