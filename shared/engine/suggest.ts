// The cheapest fingering of a one-hand line or chord sequence under the ergonomic model.
import { cheapestPath, pathCost, type Lattice } from './chain'
import { costModel } from './costs'
import { positionStarts } from './positions'
import { isBlackKey, keyCenterMm, WHITE_KEY_MM } from './keys'
import { chosenTouches, lineLattice, withOptionPenalty } from './lattice'
import { FORBIDDEN, scaleFingering, scalePhases } from './scale'
import { itemKeys, itemPitchesLowToHigh, toRightHandSpace, type Touch } from './touches'
import type { Emphasis, Finger, Hand, LineItem, SuggestInput, SuggestResult } from './types'

/**
 * Points for each note of a sequence that leaves the fingering its repetitions share. About one
 * thumb pass: enough to make a sequence's groups agree when the free optimum wavers between equal
 * choices, too little to force an awkward fingering on the first or last group (our own choice).
 */
const CONSISTENCY_POINTS = 2

/**
 * Emphasis (common practice): the thumb is the heaviest finger, so a soft note between two others is
 * better given another finger where one serves; an accent is surer on a strong finger (1, 2, 3) than
 * on 4 or 5. Points per note, our own figures: three each, as much as a thumb on a black key
 * (LEGATO_WEIGHTS), so that each moves a fingering where another serves nearly as well, yet neither
 * outweighs a position change or a scale's pattern.
 */
const SOFT_THUMB_POINTS = 3
const WEAK_ACCENT_POINTS = 3

/** Points for a finger on a note of the given emphasis; `passing` says the note lies between two others. */
export function emphasisPoints(emphasis: Emphasis | null | undefined, finger: Finger, passing: boolean): number {
  if (emphasis === 'soft' && finger === 1 && passing) return SOFT_THUMB_POINTS
  if (emphasis === 'accent' && finger >= 4) return WEAK_ACCENT_POINTS
  return 0
}

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

/** The same lattice of single notes with a cost added to each note's fingers. */
function withPenalty(lattice: Lattice, penalty: (i: number, finger: Finger) => number): Lattice {
  return withOptionPenalty(lattice, (i, option) => penalty(i, (option + 1) as Finger))
}

/** The result's fingers: a number per single note, an array per chord, low to high in pitch. */
function fingersForItems(hand: Hand, items: LineItem[], touches: Touch[][]): (Finger | Finger[])[] {
  return items.map((item, i) => {
    if (!Array.isArray(item)) return touches[i]![0]?.f ?? 1
    const byKey = new Map(touches[i]!.map(t => [t.k, t.f]))
    const fingers = itemPitchesLowToHigh(item).map(m => byKey.get(toRightHandSpace(hand, m)) ?? 1)
    return fingers
  })
}

export function suggestFingering(input: SuggestInput): SuggestResult {
  const { hand, notes, handSize = 'medium', emphasis } = input
  const keys = notes.map(item => itemKeys(hand, item))
  const marked = emphasis?.some((e, i) => e && !Array.isArray(notes[i])) ?? false
  const plain = lineLattice(keys, costModel(handSize))
  // Emphasis weighs on single notes' fingers; a chord's notes keep the model's choice.
  const lattice: Lattice = marked
    ? withPenalty(plain, (i, f) => (Array.isArray(notes[i]) ? 0 : emphasisPoints(emphasis![i], f, i > 0 && i < notes.length - 1)))
    : plain
  const line = keys.every(k => k.length === 1) ? keys.map(k => k[0]!) : null
  const phases = line ? scalePhases(line) : null
  const period = line && !phases ? sequencePeriod(line) : 0
  let path: number[]
  if (line && phases) {
    // A scale: one finger per pitch class, the pattern chosen by search over the whole run (scale.ts).
    const { allowed } = scaleFingering(line, phases, costModel(handSize))
    path = cheapestPath(withPenalty(lattice, (i, f) => (allowed(i, f) ? 0 : FORBIDDEN))).path
  }
  else if (period > 0) {
    // A drill sequence is taught with one fingering for every group, so the free optimum's most common
    // finger at each place of the group becomes a soft preference (CONSISTENCY_POINTS per deviation).
    const free = cheapestPath(lattice).path
    const groupPhases = line!.map((_, i) => i % period)
    const pattern = sharedPattern(free.map(o => (o + 1) as Finger), groupPhases)
    path = cheapestPath(withPenalty(lattice, (i, f) => (f === pattern.get(groupPhases[i]!) ? 0 : CONSISTENCY_POINTS))).path
  }
  else {
    path = cheapestPath(lattice).path
  }
  const fingers = fingersForItems(hand, notes, chosenTouches(plain, path))
  const positions = positionStarts(hand, notes, fingers, handSize)
  return { fingers, positions, positionChanges: positions.length, cost: pathCost(lattice, path) }
}
