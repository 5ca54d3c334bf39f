// A line item seen from the hand: its keys in right-hand space and the ways fingers can take them.
import type { Finger, Hand, LineItem } from './types'

/** One finger on one key, the key in right-hand space. */
export interface Touch { f: Finger, k: number }

/**
 * The left hand is the mirror image of the right, so the model only knows the right hand and the
 * left hand's keys are mirrored around D4 (62): 2·62 − midi maps white to white and black to black
 * and keeps physical distances, because the keyboard is symmetric about D (and G♯).
 */
const MIRROR_AXIS_TIMES_TWO = 124

/** Where no usable pitch is given the model still needs a key; middle C is as good as any. */
const FALLBACK_MIDI = 60

export function toRightHandSpace(hand: Hand, midi: number): number {
  const key = Number.isFinite(midi) ? Math.round(midi) : FALLBACK_MIDI
  return hand === 'left' ? MIRROR_AXIS_TIMES_TWO - key : key
}

/** An item's distinct keys in right-hand space, ascending (so fingers ascend with them). */
export function itemKeys(hand: Hand, item: LineItem): number[] {
  if (!Array.isArray(item)) return [toRightHandSpace(hand, item)]
  return [...new Set(item.map(m => toRightHandSpace(hand, m)))].sort((a, b) => a - b)
}

/** The item's notes low to high in the caller's pitch order, as the result's chord arrays are written. */
export function itemPitchesLowToHigh(item: LineItem): number[] {
  return Array.isArray(item) ? [...item].sort((a, b) => a - b) : [item]
}

const FINGERS: readonly Finger[] = [1, 2, 3, 4, 5]

function increasingChoices(count: number, from: number): Finger[][] {
  if (count === 0) return [[]]
  const out: Finger[][] = []
  for (let i = from; i <= FINGERS.length - count; i++) {
    for (const rest of increasingChoices(count - 1, i + 1)) out.push([FINGERS[i]!, ...rest])
  }
  return out
}

const optionCache = new Map<number, Finger[][]>()

/**
 * Every assignment of fingers to `count` keys that is ordered like the keys (in right-hand space,
 * finger numbers rise with pitch). More than five keys cannot be one hand's chord; they still get one
 * assignment, fingers spread over the keys, so that callers never fail on odd input.
 */
export function chordOptions(count: number): Finger[][] {
  let options = optionCache.get(count)
  if (!options) {
    options = count <= FINGERS.length
      ? increasingChoices(count, 0)
      : [Array.from({ length: count }, (_, i) => FINGERS[Math.floor((i * FINGERS.length) / count)]!)]
    optionCache.set(count, options)
  }
  return options
}

/** The touches of each item: keys in right-hand space with their fingers (chord fingers given low to high in pitch). */
export function lineTouches(hand: Hand, items: LineItem[], fingers: (Finger | Finger[])[]): Touch[][] {
  return items.map((item, i) => {
    const given = fingers[i]
    if (!Array.isArray(item)) return typeof given === 'number' ? [{ f: given, k: toRightHandSpace(hand, item) }] : []
    const list = Array.isArray(given) ? given : given === undefined ? [] : [given]
    const seen = new Set<number>()
    const touches: Touch[] = []
    itemPitchesLowToHigh(item).forEach((midi, j) => {
      const f = list[j]
      const k = toRightHandSpace(hand, midi)
      if (f === undefined || seen.has(k)) return
      seen.add(k)
      touches.push({ f, k })
    })
    return touches.sort((x, y) => x.k - y.k)
  })
}
