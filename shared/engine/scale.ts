// The fingering of a scale run: one finger per pitch class, chosen by search over the whole line.
import type { CostModel } from './costs'
import { isBlackKey } from './keys'
import type { Finger, Hand } from './types'

/**
 * Points for every note of the run that a pattern plays against one of the scale conventions below.
 * Tuned against the printed tables: the smallest round figure that keeps the conventions for scales of
 * any length (the model's cheapest rival to the printed left-hand C major is 14 points an octave
 * cheaper, and each octave has two keynotes), yet far below a move beyond reach (1000).
 */
const CONVENTION_POINTS = 10

/**
 * Points for every thumb note of a pattern whose thumb passes from a white key. A tie-break: Parncutt
 * et al. 1997 rule 12 already charges a pass on one level, but the semitone-based span rules can cancel
 * it (in A♭ major the right hand's 4 on B♭ and 4 on F cost the same without it). Common practice: the
 * printed tables put the thumb right after a black key wherever the scale allows.
 */
const WHITE_PASS_POINTS = 1

/** Stands in for "not allowed" in a lattice, where costs must stay finite. */
export const FORBIDDEN = 1e6

/**
 * A scale-like run: every step goes to the neighbouring pitch class of the line's own set (a scale of
 * five to twelve notes), by at most three semitones (the harmonic minor's augmented second), and the
 * line covers an octave. Its phases are the pitch classes, because a scale fingering is one finger per
 * pitch class (common practice: the printed tables give it so, the same up and down). A seven-step
 * scale whose degrees differ up and down (the melodic minor) has a phase per degree instead (degreePhases).
 * Otherwise null.
 */
export function scalePhases(keys: number[]): number[] | null {
  if (Math.max(...keys) - Math.min(...keys) < 12) return null
  return classPhases(keys) ?? degreePhases(keys)
}

function classPhases(keys: number[]): number[] | null {
  return neighbourPhases(keys, 5, 12, 3)
}

/**
 * Phases by pitch class for a line of `fewest` to `most` classes whose every step goes to the
 * neighbouring class of the line's own set, by at most `widest` semitones; otherwise null.
 */
function neighbourPhases(keys: number[], fewest: number, most: number, widest: number): number[] | null {
  const classes = pitchClasses(keys)
  if (classes.length < fewest || classes.length > most) return null
  const rank = new Map(classes.map((c, i) => [c, i]))
  const phases = keys.map(k => rank.get(pitchClass(k))!)
  for (let i = 1; i < keys.length; i++) {
    const step = keys[i]! - keys[i - 1]!
    const moved = (phases[i]! - phases[i - 1]! + classes.length) % classes.length
    const neighbour = (step > 0 && moved === 1) || (step < 0 && moved === classes.length - 1)
    if (!neighbour || Math.abs(step) > widest) return null
  }
  return phases
}

/** A run fingered one finger per phase: a scale, or an arpeggio (a broken chord over at least an octave). */
export type RunKind = 'scale' | 'arpeggio'

/** The widest step between neighbouring notes of an arpeggio: a fourth (a triad's inversions leap by one). */
const ARPEGGIO_STEP = 5

/**
 * An arpeggio run: three or four pitch classes (a triad, a seventh chord), every step to the
 * neighbouring class of the set by at most a fourth, over at least an octave. Its phases are the pitch
 * classes (common practice: the printed arpeggios give each chord note one finger, up and down, the
 * turns aside). Otherwise null.
 */
export function arpeggioPhases(keys: number[]): number[] | null {
  if (Math.max(...keys) - Math.min(...keys) < 12) return null
  return neighbourPhases(keys, 3, 4, ARPEGGIO_STEP)
}

const DEGREES = 7

/**
 * Phases by scale degree, for a line of single steps (one to three semitones) where every octave takes
 * seven of them and each degree keeps its key to within a semitone (F♯ going up, F coming down): one
 * finger per degree (common practice: the printed melodic minors finger each degree alike both ways).
 * The first note is degree 0.
 */
function degreePhases(keys: number[]): number[] | null {
  const degrees = [0]
  for (let i = 1; i < keys.length; i++) {
    const step = keys[i]! - keys[i - 1]!
    if (step === 0 || Math.abs(step) > 3) return null
    degrees.push(degrees[i - 1]! + Math.sign(step))
  }
  // Each degree's key, an octave folded per seven degrees, must stay within a semitone of its first.
  const first = new Map<number, number>()
  for (let i = 0; i < keys.length; i++) {
    const phase = ((degrees[i]! % DEGREES) + DEGREES) % DEGREES
    const folded = keys[i]! - 12 * Math.floor(degrees[i]! / DEGREES)
    const seen = first.get(phase)
    if (seen === undefined) first.set(phase, folded)
    else if (Math.abs(folded - seen) > 1) return null
  }
  if (first.size < DEGREES) return null
  return degrees.map(d => ((d % DEGREES) + DEGREES) % DEGREES)
}

/** A stretch of a line that goes one way, from note `from` to note `to` (both included), with its phases. */
export interface ScaleRun { from: number, to: number, phases: number[], diatonic: boolean }

const MAJOR_SCALE_CLASSES = [0, 2, 4, 5, 7, 9, 11]

/** Whether seven pitch classes are a major scale's (or a mode of one, as the natural minor; the mirror image of one is one too). */
function isDiatonic(classes: number[]): boolean {
  if (classes.length !== 7) return false
  return classes.some(root => MAJOR_SCALE_CLASSES.every(step => classes.includes((root + step) % 12)))
}

/**
 * A line whose degrees change key up and down (a melodic minor, scalePhases' degree phases) cut into
 * the stretches that go one way, each a scale of its own keys with its pitch-class phases; a turn
 * belongs to both stretches it joins. `diatonic` marks a stretch on a major scale's keys (the natural
 * minor coming down). Null where the line's own pitch classes serve both ways, or a stretch is no scale.
 */
export function scaleRuns(keys: number[]): ScaleRun[] | null {
  if (Math.max(...keys) - Math.min(...keys) < 12 || classPhases(keys) || !degreePhases(keys)) return null
  const runs: ScaleRun[] = []
  let from = 0
  for (let i = 1; i < keys.length; i++) {
    const turns = i === keys.length - 1 || Math.sign(keys[i + 1]! - keys[i]!) !== Math.sign(keys[i]! - keys[i - 1]!)
    if (!turns) continue
    const run = keys.slice(from, i + 1)
    const phases = classPhases(run)
    if (!phases) return null
    runs.push({ from, to: i, phases, diatonic: isDiatonic(pitchClasses(run)) })
    from = i
  }
  return runs
}

const pitchClass = (k: number): number => ((k % 12) + 12) % 12

function pitchClasses(keys: number[]): number[] {
  return [...new Set(keys.map(pitchClass))].sort((a, b) => a - b)
}

/** A thumb crossing between two touches: the thumb and another finger on the wrong sides of each other. */
function crosses(fa: Finger, ka: number, fb: Finger, kb: number): boolean {
  return (fa === 1) !== (fb === 1) && (fa - fb) * (ka - kb) < 0
}

/**
 * Notes at the line's edges (first, last, each turn) whose finger may leave the pattern. Common practice
 * (the printed tables): an edge note leaves it only where the hand can reach it without the thumb
 * crossing (the right hand's top C on 5, the left hand's bottom C on 5), never to change which finger
 * crosses. Only edges at least three notes from another edge are free, so that each one's choice is
 * independent of the others and the pattern search below stays exact; the rest keep the pattern.
 */
function freeEdges(keys: number[]): boolean[] {
  const n = keys.length
  const edge = keys.map((k, i) => i === 0 || i === n - 1 || (keys[i - 1]! - k) * (keys[i + 1]! - k) > 0)
  return edge.map((e, i) => e && [i - 2, i - 1, i + 1, i + 2].every(j => !edge[j]))
}

/**
 * The fingers a note may take under a pattern: its own, or at a free edge any that avoids the
 * pattern's crossing. An arpeggio's edge must avoid it where a finger can (common practice: a printed
 * arpeggio starts and ends in position, the left hand's C major on 5, not on a thumb with 4 crossing
 * over; the thumb on a black key is no such finger), while a scale's edge may keep its pattern where
 * the model finds that cheaper.
 */
function allowedFinger(keys: number[], free: boolean[], fingerAt: (i: number) => Finger, i: number, f: Finger, kind: RunKind): boolean {
  const own = fingerAt(i)
  const crossesNeighbour = (g: Finger): boolean =>
    [i - 1, i + 1].some(j => j >= 0 && j < keys.length && crosses(fingerAt(j), keys[j]!, g, keys[i]!))
  // The thumb on a black key is no way out: the printed D♭ major starts 4 1 with the thumb passing at once.
  const avoids = (g: Finger): boolean => !crossesNeighbour(g) && !(g === 1 && isBlackKey(keys[i]!))
  if (f === own) return kind === 'scale' || !free[i] || !crossesNeighbour(own) || !FINGERS.some(avoids)
  if (!free[i]) return false
  return crossesNeighbour(own) && !crossesNeighbour(f)
}

export interface ScaleFingering {
  /** Whether note i may take finger f: its class's finger, or at a free edge an alternative that avoids a crossing. */
  allowed: (i: number, f: Finger) => boolean
  /** The pattern's finger for note i (its phase's). */
  finger: (i: number) => Finger
}

const FINGERS: readonly Finger[] = [1, 2, 3, 4, 5]

/** A cost over a few notes of the line, given the finger of each. */
type Cost = (finger: (i: number) => Finger) => number

/**
 * The pattern, one finger per phase (pitch class, or degree), whose line costs least under the model
 * plus the scale conventions. Every cost of the line depends on at most three neighbouring phases (a
 * step joins neighbours, three notes span at most three, and a free edge's best finger depends only on
 * its neighbours' pattern), so the search is a second-order chain around the circle of phases:
 * exact over all 5^m patterns at a cost of about 25 · m · 125 steps after one pass over the line.
 */
export function scaleFingering(keys: number[], phases: number[], model: CostModel, kind: RunKind = 'scale', hand: Hand = 'right'): ScaleFingering {
  const m = Math.max(...phases) + 1
  const free = freeEdges(keys)
  // windows[c][(a · 5 + b) · 5 + d]: costs that depend on the fingers a, b, d of phases c − 1, c, c + 1.
  const windows = Array.from({ length: m }, () => new Float64Array(125))
  const slot = (centre: number, phase: number): number => (phase - centre + 1 + m) % m
  const fit = (notes: number[]): number => {
    for (const i of notes) {
      for (const centre of [phases[i]!, (phases[i]! + 1) % m, (phases[i]! + m - 1) % m]) {
        if (notes.every(j => slot(centre, phases[j]!) <= 2)) return centre
      }
    }
    return phases[notes[0]!]!
  }
  // Adds a cost over some notes to the window that holds their classes; `free` notes take their best allowed finger.
  const addTerm = (notes: number[], cost: Cost): void => {
    const centre = fit(notes)
    const window = windows[centre]!
    for (let j = 0; j < 125; j++) {
      const trio = [Math.floor(j / 25), Math.floor(j / 5) % 5, j % 5]
      const patternFinger = (i: number): Finger => (trio[slot(centre, phases[i]!)]! + 1) as Finger
      const edge = notes.find(i => free[i])
      if (edge === undefined) {
        window[j] = window[j]! + cost(patternFinger)
        continue
      }
      let best = Infinity
      for (const f of FINGERS) {
        if (!allowedFinger(keys, free, patternFinger, edge, f, kind)) continue
        best = Math.min(best, cost(i => (i === edge ? f : patternFinger(i))))
      }
      window[j] = window[j]! + best
    }
  }
  const n = keys.length
  const index5 = (f: Finger): number => f - 1
  const pairCost = (i: number): Cost => finger =>
    model.pair(keys[i - 1]!, keys[i]!)[index5(finger(i - 1)) * 5 + index5(finger(i))]!
  const tripleCost = (i: number): Cost => finger =>
    model.triple(keys[i - 2]!, keys[i - 1]!, keys[i]!)[(index5(finger(i - 2)) * 5 + index5(finger(i - 1))) * 5 + index5(finger(i))]!
  const firstCost: Cost = finger => model.first(keys[0]!)[index5(finger(0))]!
  // A free edge's terms go together, so that its finger is chosen once for all of them. Terms repeat
  // with every octave and every turn of the run: a term (or an edge's group) is fixed by its notes'
  // classes and the steps between them, so each distinct one is added once, times its repetitions.
  // A number per shape: each note's phase (below 12) and step from the one before (−12 … 12) in base 300, then the count.
  const shapeOf = (notes: number[]): number =>
    notes.reduce((code, i, j) => code * 300 + phases[i]! * 25 + (j === 0 ? 0 : keys[i]! - keys[notes[j - 1]!]! + 12), 0) * 8 + notes.length
  const repeated = new Map<number, { notes: number[], cost: Cost, count: number }>()
  const count = (shape: number, notes: number[], cost: Cost): void => {
    const seen = repeated.get(shape)
    if (seen) seen.count++
    else repeated.set(shape, { notes, cost, count: 1 })
  }
  const edgeTerms = new Map<number, { notes: Set<number>, costs: Cost[] }>()
  const term = (notes: number[], cost: Cost): void => {
    const edge = notes.find(i => free[i])
    if (edge === undefined) return count(shapeOf(notes), notes, cost)
    const group = edgeTerms.get(edge) ?? { notes: new Set<number>(), costs: [] }
    for (const i of notes) group.notes.add(i)
    group.costs.push(cost)
    edgeTerms.set(edge, group)
  }
  term([0], firstCost)
  for (let i = 1; i < n; i++) term([i - 1, i], pairCost(i))
  for (let i = 2; i < n; i++) term([i - 2, i - 1, i], tripleCost(i))
  for (const [edge, group] of edgeTerms) {
    const notes = [...group.notes].sort((a, b) => a - b)
    // Negative, so that an edge's group never shares a number with a single term; the edge's place and
    // whether it opens the line (and so has the first note's cost) complete its shape.
    const shape = -((shapeOf(notes) * 8 + edge - notes[0]!) * 2 + (edge === 0 ? 1 : 0))
    count(shape, notes, finger => group.costs.reduce((sum, cost) => sum + cost(finger), 0))
  }
  for (const { notes, cost, count } of repeated.values()) addTerm(notes, finger => count * cost(finger))
  addConventions(windows, keys, phases, kind, hand)
  const pattern = cheapestCycle(windows)
  const fingerAt = (i: number): Finger => pattern[phases[i]!]!
  return { allowed: (i, f) => allowedFinger(keys, free, fingerAt, i, f, kind), finger: fingerAt }
}

/**
 * The thumb passes under 3 across a fourth and under 4 across a third in arpeggios (common practice,
 * from memory: root positions 1 2 3 5, inversions and seventh chords 1 2 4 5 and 1 2 3 4, the same in
 * the left hand's mirror image; arpeggioPassFinger names the exception). In semitones, the smallest
 * passing that takes 3.
 */
const PASS_UNDER_THREE = 5

/**
 * The finger the thumb passes under into `phase` of an arpeggio (pitch classes `classes`, ascending, in
 * right-hand space): 3 across a fourth, 4 across a third, except in a triad where the passing key is
 * black and 2 and it are at most a major third apart, which takes the longer 3 in two cases. Common
 * practice, from memory:
 * - the left hand crosses 3 over the thumb onto a black key where the thumb is on a white key, or the
 *   thumb on a black key passes a major third: 5 3 2 1 in D, A, E, B and G♭ major and C, F and G minor,
 *   against 5 4 2 1 where that key is white (C, G, F major; A, E, D minor) and in E♭ minor (all black,
 *   a minor third);
 * - the right hand passes under 3 from a black key onto a white one where 2 is on a black key too, the
 *   two side by side on black keys (B♭ minor's 2 3 1 2); where 2 is on a white key its inversions keep
 *   1 2 4 5, and where 2 and the passing key are a fourth apart (D♭, A♭ and E♭ major, 4 1 2 4) it stays 4.
 */
function arpeggioPassFinger(classes: number[], phase: number, hand: Hand): Finger {
  const m = classes.length
  const at = (p: number): number => classes[(p + m) % m]!
  const passing = (at(phase) - at(phase - 1) + 12) % 12
  if (passing >= PASS_UNDER_THREE) return 3
  const reach = (at(phase - 1) - at(phase + 1) + 12) % 12
  if (m !== 3 || reach >= PASS_UNDER_THREE || !isBlackKey(at(phase - 1))) return 4
  const ontoBlack = hand === 'left'
    ? !isBlackKey(at(phase)) || passing >= MAJOR_THIRD
    : !isBlackKey(at(phase)) && isBlackKey(at(phase + 1))
  return ontoBlack ? 3 : 4
}

const MAJOR_THIRD = 4

/**
 * Scale conventions of the printed tables (common practice), charged per note of the run so that they
 * weigh the same at any length:
 * - the thumb stays off black keys;
 * - the thumb takes the run's first pitch class (a scale drill starts on its keynote) when that key is
 *   white, as every printed major and minor scale with a white keynote does in both hands, so that the
 *   hands meet on the thumbs in contrary motion;
 * - in a seven-note scale with a white keynote, the thumb's other place is the degree a fourth above the
 *   keynote in right-hand space (the right hand's fourth degree, the left hand's fifth) when that key is
 *   white, as in the printed C, G, D, A, E and B majors and their harmonic minors (and the left hand's
 *   F); the span rules alone would let the left hand cross 4 before the fifth degree in long runs;
 * - between thumbs the fingers follow one another (1 2 3, 1 2 3 4), never skipping one, which the span
 *   rules would trade at the harmonic minor's augmented second (4 then 2 in the left hand).
 * An arpeggio keeps the thumb off black keys and on its first class when white (or when every key is
 * black: such an arpeggio takes a white-key arpeggio's fingering, common practice), as a scale does, takes
 * no gap rule (1 2 4 is its usual shape), and passes the thumb under 3 or 4 by the width of the pass
 * and the colour of the key it passes from (arpeggioPassFinger).
 * A chromatic run (all twelve classes) has no keynote to meet on; instead every black key takes 3
 * (common practice, from memory: the usual chromatic fingering, 3 on the black keys and the thumb on
 * the white ones, 2 where two white keys meet), which the span rules alone, counting thumb passes,
 * would trade for 4s.
 */
function addConventions(windows: Float64Array[], keys: number[], phases: number[], kind: RunKind, hand: Hand): void {
  const m = windows.length
  const chromatic = m === 12
  // Per phase, how many of its notes fall on white keys and on black ones: a melodic minor's degree
  // has both (F♯ going up, F coming down), and a convention about a key's colour counts its notes.
  const white = new Array<number>(m).fill(0)
  const black = new Array<number>(m).fill(0)
  keys.forEach((k, i) => (isBlackKey(pitchClass(k)) ? black : white)[phases[i]!]!++)
  const keynote = phases[0]!
  const keynoteClass = pitchClass(keys[0]!)
  const fourthClass = (keynoteClass + 5) % 12
  const fourth = m === 7 && !isBlackKey(keynoteClass) && !isBlackKey(fourthClass)
    ? phases[keys.findIndex(k => pitchClass(k) === fourthClass)] ?? -1
    : -1
  const classes = pitchClasses(keys)
  // An arpeggio on black keys only (E♭ minor, G♯ major) is fingered as a white-key one, the thumb on its first note.
  const allBlack = kind === 'arpeggio' && classes.every(isBlackKey)
  for (let phase = 0; phase < m; phase++) {
    const notes = white[phase]! + black[phase]!
    // The arpeggio's thumb passing into this phase: from the class below, a third or a fourth away.
    const passFinger = kind === 'arpeggio' ? arpeggioPassFinger(classes, phase, hand) : 0
    const below = (phase + m - 1) % m
    const fromWhite = white[below]! / (white[below]! + black[below]!)
    const window = windows[phase]!
    for (let j = 0; j < 125; j++) {
      const fingerBelow = Math.floor(j / 25) + 1
      const finger = Math.floor(j / 5) % 5 + 1
      const thumb = finger === 1
      let points = 0
      if (thumb) points += CONVENTION_POINTS * black[phase]! + WHITE_PASS_POINTS * fromWhite * notes
      else if (kind === 'scale' && !chromatic && fingerBelow !== finger - 1) points += CONVENTION_POINTS * notes
      if (kind === 'arpeggio' && thumb && fingerBelow !== 1 && fingerBelow !== passFinger) points += CONVENTION_POINTS * notes
      if (chromatic) {
        if (finger !== 3) points += CONVENTION_POINTS * black[phase]!
      }
      else if (!thumb && (phase === keynote || phase === fourth)) {
        points += CONVENTION_POINTS * (allBlack ? notes : white[phase]!)
      }
      window[j] = window[j]! + points
    }
  }
}

/** The cheapest assignment of fingers around the circle of classes, window c costing fingers of c − 1, c, c + 1. */
function cheapestCycle(windows: Float64Array[]): Finger[] {
  const m = windows.length
  let best = Infinity
  let bestPattern: Finger[] = []
  for (let start = 0; start < 25; start++) {
    const f0 = Math.floor(start / 5)
    const f1 = start % 5
    // cost[b · 5 + d]: cheapest fingers of classes 0 … p + 1 ending on b at p and d at p + 1.
    let cost = new Float64Array(25).fill(Infinity)
    cost[start] = 0
    const back: Int8Array[] = []
    for (let p = 1; p <= m - 2; p++) {
      const next = new Float64Array(25).fill(Infinity)
      const from = new Int8Array(25)
      const window = windows[p]!
      for (let a = 0; a < 5; a++) {
        for (let b = 0; b < 5; b++) {
          const before = cost[a * 5 + b]!
          if (before === Infinity) continue
          for (let d = 0; d < 5; d++) {
            const v = before + window[(a * 5 + b) * 5 + d]!
            if (v < next[b * 5 + d]!) {
              next[b * 5 + d] = v
              from[b * 5 + d] = a
            }
          }
        }
      }
      back.push(from)
      cost = next
    }
    for (let end = 0; end < 25; end++) {
      const a = Math.floor(end / 5)
      const b = end % 5
      const v = cost[end]! + windows[m - 1]![(a * 5 + b) * 5 + f0]! + windows[0]![(b * 5 + f0) * 5 + f1]!
      if (v >= best) continue
      best = v
      const fingers = new Array<number>(m)
      fingers[0] = f0
      fingers[m - 1] = b
      fingers[m - 2] = a
      for (let p = m - 2; p >= 2; p--) fingers[p - 1] = back[p - 1]![fingers[p]! * 5 + fingers[p + 1]!]!
      bestPattern = fingers.map(f => (f + 1) as Finger)
    }
  }
  return bestPattern
}
