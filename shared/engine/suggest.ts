// The cheapest fingering of a one-hand line or chord sequence under the ergonomic model.
import { cheapestPath, pathCost, type Lattice } from './chain'
import { costModel, positionStarts, type Touch } from './ergonomics'
import { isBlackKey, keyCenterMm, WHITE_KEY_MM } from './keys'
import { chosenTouches, lineLattice } from './lattice'
import { itemKeys, itemPitchesLowToHigh, toRightHandSpace } from './touches'
import type { Finger, Hand, LineItem, SuggestInput, SuggestResult } from './types'

/**
 * Points for each note of a sequence that leaves the fingering its repetitions share. About one
 * thumb pass: enough to make a sequence's groups agree when the free optimum wavers between equal
 * choices, too little to force an awkward fingering on the first or last group (our own choice).
 */
const CONSISTENCY_POINTS = 2

/** Longest repeated group looked for; drill sequences repeat groups of a few notes. */
const MAX_PERIOD = 32

/**
 * A note's shape in a sequence: the physical step from the previous key in half white keys (Jacobs
 * 2001 argued that hands feel key positions, not semitones) and the key's colour. Two stretches of a
 * line have the same shape exactly when a hand would meet the same landscape in both.
 */
function shapeOf(keys: number[], i: number): number {
  const colour = isBlackKey(keys[i]!) ? 1 : 0
  if (i === 0) return colour
  const step = Math.round((2 * (keyCenterMm(keys[i]!) - keyCenterMm(keys[i - 1]!))) / WHITE_KEY_MM)
  return step * 2 + colour
}

/**
 * The smallest period of the shape sequence with at least two whole groups, or 0. A period of 1
 * (a run such as a white-key scale, the same step on the same colour throughout) is not a sequence.
 */
export function sequencePeriod(keys: number[]): number {
  const n = keys.length
  const shapes = keys.map((_, i) => shapeOf(keys, i))
  for (let p = 1; p <= Math.min(MAX_PERIOD, Math.floor(n / 2)); p++) {
    let repeats = true
    for (let i = p; i < n && repeats; i++) {
      // The first note has no step of its own, so only its colour can be compared.
      const same = i === p ? (shapes[i]! & 1) === shapes[0] : shapes[i] === shapes[i - p]
      if (!same) repeats = false
    }
    if (repeats) return p === 1 ? 0 : p
  }
  return 0
}

/**
 * A scale-like run: every step goes to the neighbouring pitch class of the line's own set (a scale of
 * five to twelve notes) and the line covers an octave. Its phases are the pitch classes, because a
 * scale fingering is one finger per pitch class (common practice: the printed tables give it so, the
 * same up and down), or null.
 */
export function scalePhases(keys: number[]): number[] | null {
  const classes = [...new Set(keys.map(k => ((k % 12) + 12) % 12))].sort((a, b) => a - b)
  if (classes.length < 5 || Math.max(...keys) - Math.min(...keys) < 12) return null
  const rank = new Map(classes.map((c, i) => [c, i]))
  const phases = keys.map(k => rank.get(((k % 12) + 12) % 12)!)
  for (let i = 1; i < keys.length; i++) {
    const step = keys[i]! - keys[i - 1]!
    const moved = (phases[i]! - phases[i - 1]! + classes.length) % classes.length
    const neighbour = (step > 0 && moved === 1) || (step < 0 && moved === classes.length - 1)
    if (!neighbour || Math.abs(step) > 2) return null
  }
  return phases
}

/** The finger most often used at each phase (ties to the lower finger). */
function sharedPattern(fingers: Finger[], phases: number[]): Map<number, Finger> {
  const counts = new Map<number, number[]>()
  phases.forEach((phase, i) => {
    const c = counts.get(phase) ?? [0, 0, 0, 0, 0, 0]
    c[fingers[i]!]!++
    counts.set(phase, c)
  })
  return new Map([...counts].map(([phase, c]) => {
    let best = 1
    for (let f = 2; f <= 5; f++) if (c[f]! > c[best]!) best = f
    return [phase, best as Finger]
  }))
}

/** The same lattice with a cost on each single-note option that differs from the preferred finger. */
function withPreference(lattice: Lattice, prefer: Finger[]): Lattice {
  const penalise = (costs: ArrayLike<number>, size: number, finger: Finger): Float64Array => {
    const out = Float64Array.from(costs)
    for (let j = 0; j < out.length; j++) if ((j % size) !== finger - 1) out[j] = out[j]! + CONSISTENCY_POINTS
    return out
  }
  return {
    sizes: lattice.sizes,
    first: () => penalise(lattice.first(), lattice.sizes[0]!, prefer[0]!),
    pair: i => penalise(lattice.pair(i), lattice.sizes[i]!, prefer[i]!),
    triple: i => lattice.triple(i),
  }
}

/** The result's fingers: a number per single note, an array per chord, low to high in pitch. */
export function fingersForItems(hand: Hand, items: LineItem[], touches: Touch[][]): (Finger | Finger[])[] {
  return items.map((item, i) => {
    if (!Array.isArray(item)) return touches[i]![0]?.f ?? 1
    const byKey = new Map(touches[i]!.map(t => [t.k, t.f]))
    const fingers = itemPitchesLowToHigh(item).map(m => byKey.get(toRightHandSpace(hand, m)) ?? 1)
    return fingers
  })
}

export function suggestFingering(input: SuggestInput): SuggestResult {
  const { hand, notes, handSize = 'medium' } = input
  const keys = notes.map(item => itemKeys(hand, item))
  const lattice = lineLattice(keys, costModel(handSize))
  let { path } = cheapestPath(lattice)
  // Repeated shapes: a drill sequence is taught with one fingering for every group, and a scale with
  // one finger per pitch class, so the free optimum's most common finger at each place of the group
  // (or pitch class) becomes a soft preference (a second search with CONSISTENCY_POINTS per deviation).
  const line = keys.every(k => k.length === 1) ? keys.map(k => k[0]!) : null
  const period = line ? sequencePeriod(line) : 0
  const phases = line ? scalePhases(line) ?? (period > 0 ? line.map((_, i) => i % period) : null) : null
  if (phases) {
    const pattern = sharedPattern(path.map(o => (o + 1) as Finger), phases)
    path = cheapestPath(withPreference(lattice, phases.map(phase => pattern.get(phase)!))).path
  }
  const fingers = fingersForItems(hand, notes, chosenTouches(lattice, path))
  const positions = positionStarts(hand, notes, fingers, handSize)
  return { fingers, positions, positionChanges: positions.length, cost: pathCost(lattice, path) }
}
