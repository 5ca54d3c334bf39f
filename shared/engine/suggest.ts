// The cheapest fingering of a one-hand line or chord sequence under the ergonomic model.
import { cheapestPath, dearestStep, pathCost, type Lattice } from './chain'
import { costModel, type CostModel } from './costs'
import { positionStarts } from './positions'
import { isBlackKey, keyCenterMm, WHITE_KEY_MM } from './keys'
import { chosenTouches, lineLattice, withOptionPenalty } from './lattice'
import { arpeggioPhases, FORBIDDEN, scaleFingering, scalePhases, scaleRuns, type ScaleFingering, type ScaleRun } from './scale'
import { itemKeys, itemPitchesLowToHigh, toRightHandSpace, type Touch } from './touches'
import type { Emphasis, Finger, Hand, HandSize, LineItem, SuggestInput, SuggestResult } from './types'

/**
 * Points for each note of a sequence that leaves the fingering its repetitions share. As much as a
 * scale convention (scale.ts): every group of a sequence whose key colours repeat is taught with one
 * fingering (common practice), the last group included, and since the groups meet the same keys the
 * shared fingering is as playable in each.
 */
const CONSISTENCY_POINTS = 10

/**
 * A trill or alternation: at least five notes alternating between two keys at most a minor third apart
 * (four notes, B A B A, are as often two groups of a sequence; wider alternations are leaps, which
 * neighbouring fingers do not span). It stays in one position
 * on two neighbouring strong fingers (common practice: 1–2 or 2–3, never 4–5, never a thumb crossing
 * inside it), so in right-hand space its lower key takes 1 or 2 and its upper key 2 or 3.
 */
const ALTERNATION_NOTES = 5
const ALTERNATION_SPAN = 3

/**
 * A broken chord within one hand's reach: three to five different keys no more than an octave apart,
 * every move a leap of at least a minor third (or a repeated key), such as C E G E C or an Alberti bass
 * C G E G. It is fingered as the same keys struck together (common practice: a broken chord keeps its
 * block chord's fingers, C E G with 1 3 5, E G C with 1 2 5); returns each key's finger, or null.
 */
function brokenChordFingers(keys: number[], model: CostModel): Map<number, Finger> | null {
  const distinct = [...new Set(keys)].sort((a, b) => a - b)
  if (distinct.length < 3 || distinct.length > 5 || distinct[distinct.length - 1]! - distinct[0]! > 12) return null
  for (let i = 1; i < keys.length; i++) {
    const step = Math.abs(keys[i]! - keys[i - 1]!)
    if (step !== 0 && step < 3) return null
  }
  const chord = lineLattice([distinct], model)
  const [option] = cheapestPath(chord).path
  const fingers = chord.options[0]![option!]!
  return new Map(distinct.map((k, j) => [k, fingers[j]!]))
}

/** A cost this large means a move beyond reach or one finger on two keys (LEGATO_WEIGHTS: 1000). */
const UNPLAYABLE = 1000

/** For each note, the fingers an alternation allows it, or null outside one. */
export function alternationFingers(keys: number[]): (readonly Finger[] | null)[] {
  const allowed: (readonly Finger[] | null)[] = keys.map(() => null)
  let start = 0
  for (let i = 1; i <= keys.length; i++) {
    const alternates = i < keys.length && keys[i] !== keys[i - 1] && Math.abs(keys[i]! - keys[i - 1]!) <= ALTERNATION_SPAN
      && (i - start < 2 || keys[i] === keys[i - 2])
    if (alternates) continue
    if (i - start >= ALTERNATION_NOTES) {
      const low = Math.min(keys[start]!, keys[start + 1]!)
      for (let j = start; j < i; j++) allowed[j] = keys[j] === low ? [1, 2] : [2, 3]
    }
    start = i - 1
  }
  return allowed
}

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
export function sharedPattern(fingers: Finger[], phases: number[]): Map<number, Finger> {
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

/**
 * A melodic minor keeps one finger per degree both ways (`perDegree`) where that puts the thumbs where
 * the natural minor coming down has them; where it cannot (the right hand's F♯ and C♯ minors, whose
 * raised sixth going up is a black key under the natural minor's thumb), each way is fingered as a
 * scale of its own keys (scaleRuns), the turns taking either way's finger. Common practice, from
 * memory: the printed melodic minors are the harmonic minor's fingering, the thumb moved to the
 * seventh going up only where the raised sixth is black.
 */
function melodicFingering(line: number[], runs: ScaleRun[], perDegree: ScaleFingering, model: CostModel): (i: number, f: Finger) => boolean {
  const fingerings = runs.map(run => scaleFingering(line.slice(run.from, run.to + 1), run.phases, model, 'scale'))
  const thumbsKept = runs.every((run, r) => !run.diatonic
    || line.slice(run.from, run.to + 1).every((_, j) => (fingerings[r]!.finger(j) === 1) === (perDegree.finger(run.from + j) === 1)))
  if (thumbsKept) return perDegree.allowed
  return (i, f) => runs.some((run, r) => i >= run.from && i <= run.to && fingerings[r]!.allowed(i - run.from, f))
}

/**
 * A trill keeps one pair of neighbouring fingers throughout (common practice: no change of finger
 * inside it, and 1–2 or 2–3, not 1–3): each of its notes takes the finger its key took two notes before,
 * one away from the finger of the note between. The per-note sets of alternationFingers alone would let
 * the search trade 1–2 for 2–3 halfway through.
 */
function withOnePair(lattice: Lattice, trill: (readonly Finger[] | null)[]): Lattice {
  const table = new Float64Array(125)
  return {
    ...lattice,
    triple: (i) => {
      const base = lattice.triple(i)
      if (!trill[i] || !trill[i - 1] || !trill[i - 2]) return base
      for (let a = 0; a < 5; a++) {
        for (let b = 0; b < 5; b++) {
          for (let c = 0; c < 5; c++) {
            const t = (a * 5 + b) * 5 + c
            table[t] = (base?.[t] ?? 0) + (a === c && Math.abs(b - c) === 1 ? 0 : FORBIDDEN)
          }
        }
      }
      return table
    },
  }
}

/**
 * The fingers a scale or arpeggio run allows each of its notes (one finger per pitch class, the pattern
 * chosen by search over the whole run, scale.ts), or null where the line is no such run.
 */
function runFingering(line: number[], hand: Hand, handSize: HandSize): ((i: number, f: Finger) => boolean) | null {
  const scale = scalePhases(line)
  const phases = scale ?? arpeggioPhases(line)
  if (!phases) return null
  const model = costModel(handSize)
  const fingering = scaleFingering(line, phases, model, scale ? 'scale' : 'arpeggio', hand)
  const runs = scale ? scaleRuns(line) : null
  return runs ? melodicFingering(line, runs, fingering, model) : fingering.allowed
}

/** The widest step of a scale run (the harmonic minor's augmented second, scale.ts). */
const SCALE_STEP = 3

/**
 * Runs inside a line that is no run as a whole: each stretch between the notes `apart` sets aside (a
 * trill's) keeps the fingering it would have alone where it is a scale or arpeggio run, and where it
 * is not, each piece of it between leaps wider than a scale step does where that piece is a scale.
 * Common practice: a run into a trill, a leap or any other figure is fingered as the scale, and only
 * the move from the run's last note onto what follows changes the hand's place, so the junction is the
 * one move the search chooses freely. Notes outside such a run are free. Null where no run is found.
 */
function runsWithin(line: number[], apart: (i: number) => boolean, hand: Hand, handSize: HandSize): Uint8Array | null {
  // Per note, the fingers allowed as bits (finger f at bit f − 1); every finger outside the runs.
  const allowed = new Uint8Array(line.length).fill(ALL_FINGERS)
  let found = false
  const keep = (from: number, to: number): boolean => {
    const run = to - from > 1 ? runFingering(line.slice(from, to), hand, handSize) : null
    if (!run) return false
    for (let j = from; j < to; j++) {
      let bits = 0
      for (let f = 1; f <= 5; f++) if (run(j - from, f as Finger)) bits |= 1 << (f - 1)
      allowed[j] = bits
    }
    found = true
    return true
  }
  const pieces = (from: number, to: number): void => {
    let start = from
    for (let i = from + 1; i <= to; i++) {
      if (i < to && Math.abs(line[i]! - line[i - 1]!) <= SCALE_STEP) continue
      keep(start, i)
      start = i
    }
  }
  let from = 0
  for (let i = 0; i <= line.length; i++) {
    if (i < line.length && !apart(i)) continue
    if (i > from && !keep(from, i)) pieces(from, i)
    from = i + 1
  }
  return found ? allowed : null
}

const ALL_FINGERS = 0b11111

/**
 * A lattice of single notes with every finger outside `allowed` (bits, as runsWithin) forbidden. Only
 * the notes with a finger forbidden get a table of their own, refilled at each call (Lattice), so a
 * long line with a few runs in it costs no more to search than without them.
 */
function withAllowed(lattice: Lattice, allowed: Uint8Array): Lattice {
  const table = new Float64Array(25)
  const limit = (costs: ArrayLike<number>, i: number, into: Float64Array): ArrayLike<number> => {
    const bits = allowed[i]!
    if (bits === ALL_FINGERS) return costs
    for (let j = 0; j < costs.length; j++) into[j] = costs[j]! + ((bits >> (j % 5)) & 1 ? 0 : FORBIDDEN)
    return into.length === costs.length ? into : into.subarray(0, costs.length)
  }
  return {
    ...lattice,
    first: () => limit(lattice.first(), 0, new Float64Array(5)),
    pair: i => limit(lattice.pair(i), i, table),
  }
}

/**
 * A pattern's fingering (a run's, a broken chord's block-chord fingers, a trill's pair), unless it
 * leaves a move no hand of this size can play legato where the free optimum leaves none: a small
 * hand's reach from a run's last finger across a following leap, or onto a trill after a leap, or a
 * block chord's fingers too far apart to join its notes. A pattern is a teaching convention, and a
 * convention the hand cannot play is not taught. Playability is judged move by move on `plain`, the
 * moves alone, as the pattern's own penalties may stand in its path where it bends (a run meeting a trill).
 */
function playableOr(patterned: number[], plain: Lattice, lattice: Lattice): number[] {
  if (dearestStep(plain, patterned) < UNPLAYABLE) return patterned
  const free = cheapestPath(lattice).path
  return dearestStep(plain, free) < UNPLAYABLE ? free : patterned
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
  const trill = line ? alternationFingers(line) : null
  const hasTrill = trill?.some(a => a !== null) ?? false
  // A trill is no scale or arpeggio run: its notes keep their two fingers whatever the run's pattern.
  const run = line && !hasTrill ? runFingering(line, hand, handSize) : null
  const broken = line && !run && !hasTrill ? brokenChordFingers(line, costModel(handSize)) : null
  const period = line && !run && !hasTrill && !broken ? sequencePeriod(line) : 0
  let path: number[]
  if (run) {
    path = playableOr(cheapestPath(withPenalty(lattice, (i, f) => (run(i, f) ? 0 : FORBIDDEN))).path, plain, lattice)
  }
  else if (broken) {
    path = playableOr(cheapestPath(withPenalty(lattice, (i, f) => (broken.get(line![i]!) === f ? 0 : FORBIDDEN))).path, plain, lattice)
  }
  else if (hasTrill) {
    const runs = runsWithin(line!, i => trill![i] !== null, hand, handSize)
    const trilled = (alternations: (readonly Finger[] | null)[], free: (i: number) => boolean): number[] => {
      const allowed = withPenalty(lattice, (i, f) => (free(i) || (alternations[i] ? alternations[i]!.includes(f) : ((runs?.[i] ?? ALL_FINGERS) >> (f - 1)) & 1) ? 0 : FORBIDDEN))
      return cheapestPath(withOnePair(allowed, alternations)).path
    }
    path = trilled(trill!, () => false)
    if (dearestStep(plain, path) >= UNPLAYABLE) {
      // The hand changes its place at a trill's edges first: the note before it and its last note are
      // free (a finger changed onto the trill, a substitution on its last note), the rest keeps its pattern.
      const lastOfTrill = (i: number): boolean => trill![i] !== null && (i + 1 >= trill!.length || trill![i + 1] === null)
      const beforeTrill = (i: number): boolean => trill![i] === null && i + 1 < trill!.length && trill![i + 1] !== null
      path = playableOr(trilled(trill!.map((a, i) => (lastOfTrill(i) ? null : a)), i => beforeTrill(i) || lastOfTrill(i)), plain, lattice)
    }
  }
  else if (period > 0) {
    // A drill sequence is taught with one fingering for every group, so the free optimum's most common
    // finger at each place of the group becomes the rule (CONSISTENCY_POINTS per deviation).
    const free = cheapestPath(lattice).path
    const groupPhases = line!.map((_, i) => i % period)
    const pattern = sharedPattern(free.map(o => (o + 1) as Finger), groupPhases)
    path = cheapestPath(withPenalty(lattice, (i, f) => (f === pattern.get(groupPhases[i]!) ? 0 : CONSISTENCY_POINTS))).path
  }
  else {
    const runs = line ? runsWithin(line, () => false, hand, handSize) : null
    path = runs ? playableOr(cheapestPath(withAllowed(lattice, runs)).path, plain, lattice) : cheapestPath(lattice).path
  }
  const fingers = fingersForItems(hand, notes, chosenTouches(plain, path))
  const positions = positionStarts(hand, notes, fingers, handSize)
  return { fingers, positions, positionChanges: positions.length, cost: pathCost(lattice, path) }
}
