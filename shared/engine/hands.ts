// Which hand plays which note: a search over both hands together, then each hand's fingering.
import { costModel, weigh, type CostModel } from './costs'
import { chordRules, PERFORMANCE_WEIGHTS } from './ergonomics'
import { midiFromName } from './pitch'
import { suggestFingering } from './suggest'
import { chordOptions, itemPitchesLowToHigh, toRightHandSpace } from './touches'
import type { DrillMusic, Emphasis, Finger, Hand, HandSize, LineItem } from './types'

/**
 * Where each hand waits before its first note, in right-hand space: the right hand around G4, the
 * left around F3 (its mirror image), a fifth to either side of middle C (our own choice). A hand's
 * first note pays its travel from there, so that no hand is kept back to arrive far away for nothing.
 */
const HOME_KEY = 67

/** Middle C: a note's side of it is a faint preference for its hand, and the split of a chord that both hands reach. */
const SPLIT_MIDI = 60

/**
 * Points per semitone a note lies on the other hand's side of middle C, counted up to SIDE_SEMITONES
 * (our own choice: a tie-break that leaves the middle-C split where nothing else decides, never a
 * reason against hand over hand).
 */
const SIDE_POINTS = 0.1
const SIDE_SEMITONES = 6

/**
 * Points when a line passes from one hand to the other by less than an octave: a figure stays in one
 * hand unless sharing it saves more than the weak fingers of a five-finger pattern (our own choice);
 * a leap of an octave or more may change hands for nothing (hand over hand).
 */
const HANDOFF_POINTS = 3
const HANDOFF_FREE_LEAP = 12

/**
 * The most a hand that rested for at least one item pays to move anywhere: it had the other hand's
 * note to get there (our own choice, below a leap beyond reach in the hand that just played, 5).
 */
const RESTED_MOVE_POINTS = 2

/** Points per semitone a hand travels (our own choice: a leap of two octaves is dearer than one of one). */
const TRAVEL_POINTS = 1 / 12

/**
 * Points when a hand moves to the far side of the other (hand over hand). Dearer than a handoff, cheaper
 * than a leap beyond reach in one hand (PERFORMANCE_WEIGHTS: 5), so that leaps up or down the keyboard
 * go hand over hand (common practice) while ordinary lines keep their sides.
 */
const CROSS_OVER_POINTS = 2

export interface HandsInput {
  notes: LineItem[]
  handSize?: HandSize
  /** Each item's emphasis, handed on to each hand's fingering (suggest.ts). */
  emphasis?: (Emphasis | null | undefined)[]
}

export interface HandsResult {
  /** The hand of each note; for a chord an array, low to high in pitch. */
  hands: (Hand | Hand[])[]
  /** Each note's finger in its hand; for a chord an array, low to high in pitch. */
  fingers: (Finger | Finger[])[]
  /** Items where either hand begins a new position (the first item of each hand not counted). */
  positions: number[]
  positionChanges: number
  /** Both hands' fingering costs under the ergonomic model. */
  cost: number
}

/** One way to play an item: the notes (low to high in pitch) each hand takes, and the key each hand's moves start from. */
interface ItemOption {
  right: number[]
  left: number[]
  /** The key (right-hand space) that stands for each hand's part in moves: its thumb side; null where the hand rests. */
  key: Record<Hand, number | null>
  /** The parts' own costs: chord shapes and sides of middle C. */
  own: number
}

const HANDS: readonly Hand[] = ['right', 'left']

/** The cost of one hand's chord part under its cheapest fingering, and its lowest key in right-hand space. */
function chordPart(hand: Hand, pitches: number[], model: CostModel): { key: number, cost: number } {
  const keys = pitches.map(m => toRightHandSpace(hand, m)).sort((a, b) => a - b)
  let cost = Infinity
  for (const fingers of chordOptions(keys.length)) {
    cost = Math.min(cost, weigh(model.weights, add => chordRules(model.table, keys.map((k, j) => ({ f: fingers[j]!, k })), add)))
  }
  return { key: keys[0]!, cost }
}

const sidePoints = (hand: Hand, pitches: number[]): number =>
  pitches.reduce((sum, m) => sum + SIDE_POINTS * Math.min(SIDE_SEMITONES, Math.max(0, hand === 'right' ? SPLIT_MIDI - m : m - SPLIT_MIDI)), 0)

/**
 * Points for splitting a chord that one hand could take (common practice: a chord within one hand's
 * reach is played by one hand; our own figure, above a triad's weak-finger point).
 */
const CHORD_SPLIT_POINTS = 3

/**
 * The ways to play an item: a single note by either hand; a chord by either hand where it fits one
 * hand (at most five notes), or split between the hands at each gap. The fingers come later, from
 * each hand's own suggestion; here a move costs its cheapest pair of fingers (see moveCost).
 */
function itemOptions(item: LineItem, model: CostModel): ItemOption[] {
  const pitches = itemPitchesLowToHigh(item)
  if (!Array.isArray(item)) {
    return HANDS.map(hand => ({
      right: hand === 'right' ? pitches : [],
      left: hand === 'left' ? pitches : [],
      key: { right: hand === 'right' ? pitches[0]! : null, left: hand === 'left' ? toRightHandSpace('left', pitches[0]!) : null },
      own: sidePoints(hand, pitches),
    }))
  }
  // More than ten notes cannot be two hands' chord; they are still split, in the middle, so that odd input never fails.
  const splits = Array.from({ length: pitches.length + 1 }, (_, split) => split)
    .filter(split => split <= 5 && pitches.length - split <= 5)
  return (splits.length ? splits : [Math.ceil(pitches.length / 2)]).map((split) => {
    const left = pitches.slice(0, split)
    const right = pitches.slice(split)
    const parts = { right: right.length ? chordPart('right', right, model) : null, left: left.length ? chordPart('left', left, model) : null }
    // A chord part's moves start from its lowest key in right-hand space: the thumb's side.
    return {
      right,
      left,
      key: { right: parts.right?.key ?? null, left: parts.left?.key ?? null },
      own: (parts.right?.cost ?? 0) + (parts.left?.cost ?? 0) + sidePoints('right', right) + sidePoints('left', left)
        + (left.length && right.length ? CHORD_SPLIT_POINTS : 0),
    }
  })
}

/** The most options an item has: a chord of five notes split at each of its six places. */
const MAX_OPTIONS = 6

/**
 * States kept per item. A state is where each hand last played (item and option); keeping the
 * cheapest BEAM of them makes the search linear in the line's length (our own choice: the tests'
 * lines come out the same with a beam eight times as wide).
 */
const BEAM = 16

/** Every option's keys as flat arrays, so that the search's inner loop reads numbers only. */
interface Flat {
  /** Per hand (0 right, 1 left), per item · MAX_OPTIONS + option: the part's key in right-hand space (−1 where the hand rests) and its pitch. */
  key: [Int32Array, Int32Array]
  pitch: [Int32Array, Int32Array]
  own: Float64Array
  count: Int8Array
}

function flatten(options: ItemOption[][]): Flat {
  const size = options.length * MAX_OPTIONS
  const flat: Flat = {
    key: [new Int32Array(size).fill(-1), new Int32Array(size).fill(-1)],
    pitch: [new Int32Array(size), new Int32Array(size)],
    own: new Float64Array(size),
    count: new Int8Array(options.length),
  }
  options.forEach((list, i) => {
    flat.count[i] = list.length
    list.forEach((o, c) => {
      const at = i * MAX_OPTIONS + c
      flat.own[at] = o.own
      for (const h of [0, 1] as const) {
        const hand = HANDS[h]!
        const k = o.key[hand]
        if (k === null) continue
        flat.key[h][at] = k
        flat.pitch[h][at] = toRightHandSpace(hand, k)
      }
    })
  })
  return flat
}

const cheapestMoves = new WeakMap<CostModel, Float64Array>()

/** Moves are cached by the first key's pitch class and the interval, up to this many semitones either way. */
const MOVE_RANGE = 128

/** The cheapest move between two keys over all pairs of fingers, under the model (cached per model). */
function moveCost(model: CostModel, from: number, to: number): number {
  let cache = cheapestMoves.get(model)
  if (!cache) {
    cache = new Float64Array(12 * (2 * MOVE_RANGE + 1)).fill(-1)
    cheapestMoves.set(model, cache)
  }
  const d = Math.max(-MOVE_RANGE, Math.min(MOVE_RANGE, to - from))
  const slot = (((from % 12) + 12) % 12) * (2 * MOVE_RANGE + 1) + d + MOVE_RANGE
  let cost = cache[slot]!
  if (cost < 0) {
    cost = Math.min(...model.pair(from, from + d))
    cache[slot] = cost
  }
  return cost
}

/**
 * Hands for every item by a beam search over both hands at once, each hand remembered by the key it
 * last played. A move within a hand costs the model's cheapest pair of fingers for it under the
 * performance weights (PERFORMANCE_WEIGHTS: a leap beyond reach is dear, not impossible), at most
 * RESTED_MOVE_POINTS for a hand that rested, plus its travel; handoffs, hand over hand, split chords
 * and sides of middle C add the points above.
 */
function chooseOptions(notes: LineItem[], options: ItemOption[][], model: CostModel): number[] {
  const n = options.length
  const flat = flatten(options)
  const lowest = notes.map(item => itemPitchesLowToHigh(item)[0]!)
  // Each layer: the kept states' last flat index of each hand (−1 before its first note), cost, parent and option.
  const parents = new Int32Array(n * BEAM)
  const chosenOption = new Int8Array(n * BEAM)
  let right = new Int32Array(BEAM)
  let left = new Int32Array(BEAM)
  let cost = new Float64Array(BEAM)
  let size = 1
  right[0] = -1
  left[0] = -1
  const width = BEAM * MAX_OPTIONS
  const candRight = new Int32Array(width)
  const candLeft = new Int32Array(width)
  const candCost = new Float64Array(width)
  const candParent = new Int32Array(width)
  const candOption = new Int8Array(width)
  const sorted = new Float64Array(width)
  const handCost = (h: 0 | 1, from: number, at: number, other: number, rested: boolean): number => {
    const k = flat.key[h][at]!
    if (from < 0) return TRAVEL_POINTS * Math.abs(k - HOME_KEY)
    const fromK = flat.key[h][from]!
    const step = fromK === k ? 0 : moveCost(model, fromK, k)
    let points = (rested ? Math.min(step, RESTED_MOVE_POINTS) : step) + TRAVEL_POINTS * Math.abs(k - fromK)
    if (other >= 0) {
      // Hand over hand: the right hand moving below the left's last note, or the left above the right's.
      const otherPitch = flat.pitch[1 - h]![other]!
      const side = h === 0 ? 1 : -1
      if (side * (flat.pitch[h][from]! - otherPitch) >= 0 && side * (flat.pitch[h][at]! - otherPitch) < 0) points += CROSS_OVER_POINTS
    }
    return points
  }
  const stride = n * MAX_OPTIONS + 1
  // The candidates of one item by their key, in a small open-addressing table stamped with the item.
  const slots = 4 * width
  const slotKey = new Int32Array(slots)
  const slotCandidate = new Int32Array(slots)
  const slotStamp = new Int32Array(slots).fill(-1)
  let nextRight = new Int32Array(BEAM)
  let nextLeft = new Int32Array(BEAM)
  let nextCost = new Float64Array(BEAM)
  for (let i = 0; i < n; i++) {
    const previous = (i - 1) * MAX_OPTIONS
    let count = 0
    for (let s = 0; s < size; s++) {
      const r = right[s]!
      const l = left[s]!
      const rightJust = i > 0 && r >= previous
      const leftJust = i > 0 && l >= previous
      for (let c = 0; c < flat.count[i]!; c++) {
        const at = i * MAX_OPTIONS + c
        const playsRight = flat.key[0][at]! >= 0
        const playsLeft = flat.key[1][at]! >= 0
        let points = cost[s]! + flat.own[at]!
        if (playsRight) points += handCost(0, r, at, l, !rightJust)
        if (playsLeft) points += handCost(1, l, at, r, !leftJust)
        const handoff = (playsRight && !playsLeft && leftJust && !rightJust) || (playsLeft && !playsRight && rightJust && !leftJust)
        if (handoff && Math.abs(lowest[i]! - lowest[i - 1]!) < HANDOFF_FREE_LEAP) points += HANDOFF_POINTS
        const nr = playsRight ? at : r
        const nl = playsLeft ? at : l
        // The same hands' places reached twice: keep the cheaper way.
        // One hand is at this item (option c); the state is told apart by the other's place (a small integer key).
        const other = playsRight && playsLeft ? -1 : playsRight ? nl : nr
        const id = ((playsRight ? 1 : 0) + (playsLeft ? 2 : 0) + 4 * c) * stride + other + 1
        let slot = id % slots
        while (slotStamp[slot] === i && slotKey[slot] !== id) slot = (slot + 1) % slots
        const same = slotStamp[slot] === i ? slotCandidate[slot]! : -1
        if (same >= 0 && candCost[same]! <= points) continue
        const into = same >= 0 ? same : count++
        if (same < 0) {
          slotStamp[slot] = i
          slotKey[slot] = id
          slotCandidate[slot] = into
        }
        candRight[into] = nr
        candLeft[into] = nl
        candCost[into] = points
        candParent[into] = s
        candOption[into] = c
      }
    }
    // The BEAM cheapest candidates, in their own order.
    let limit = Infinity
    if (count > BEAM) {
      sorted.set(candCost.subarray(0, count))
      limit = sorted.subarray(0, count).sort()[BEAM - 1]!
    }
    size = 0
    for (let j = 0; j < count && size < BEAM; j++) {
      if (candCost[j]! > limit) continue
      nextRight[size] = candRight[j]!
      nextLeft[size] = candLeft[j]!
      nextCost[size] = candCost[j]!
      parents[i * BEAM + size] = candParent[j]!
      chosenOption[i * BEAM + size] = candOption[j]!
      size++
    }
    const swapRight = right
    right = nextRight
    nextRight = swapRight
    const swapLeft = left
    left = nextLeft
    nextLeft = swapLeft
    const swapCost = cost
    cost = nextCost
    nextCost = swapCost
  }
  let index = 0
  for (let s = 1; s < size; s++) if (cost[s]! < cost[index]!) index = s
  const chosen = new Array<number>(n)
  for (let i = n - 1; i >= 0; i--) {
    chosen[i] = chosenOption[i * BEAM + index]!
    index = parents[i * BEAM + index]!
  }
  return chosen
}

/** Hands and fingers for a line that both hands share (`suggest` with `"hand": "both"`). */
export function suggestHands(input: HandsInput): HandsResult {
  const { notes, handSize = 'medium', emphasis } = input
  const model = costModel(handSize, PERFORMANCE_WEIGHTS)
  const options = notes.map(item => itemOptions(item, model))
  const chosen = notes.length ? chooseOptions(notes, options, model) : []
  const parts = chosen.map((c, i) => options[i]![c]!)
  const hands: (Hand | Hand[])[] = notes.map((item, i) => {
    const part = parts[i]!
    if (!Array.isArray(item)) return part.right.length ? 'right' : 'left'
    return itemPitchesLowToHigh(item).map((_, j) => (j < part.left.length ? 'left' : 'right'))
  })
  const fingers: (Finger | Finger[])[] = notes.map(item => (Array.isArray(item) ? [] : 1))
  const positions = new Set<number>()
  let cost = 0
  // The left hand first, so that each chord's fingers are gathered low to high.
  for (const hand of ['left', 'right'] as const) {
    const items = parts.flatMap((p, i) => (p[hand].length ? [i] : []))
    if (items.length === 0) continue
    const line: LineItem[] = items.map(i => (Array.isArray(notes[i]) ? parts[i]![hand] : parts[i]![hand][0]!))
    const result = suggestFingering({ hand, notes: line, handSize, emphasis: emphasis && items.map(i => emphasis[i]) })
    cost += result.cost
    for (const k of result.positions) positions.add(items[k]!)
    items.forEach((i, k) => {
      const given = result.fingers[k]!
      if (!Array.isArray(notes[i])) fingers[i] = given
      else (fingers[i] as Finger[]).push(...(Array.isArray(given) ? given : [given]))
    })
  }
  const sorted = [...positions].sort((a, b) => a - b)
  return { hands, fingers, positions: sorted, positionChanges: sorted.length, cost }
}

/**
 * The hand of every note of a drill: its own mark; the drill's hand; or, in a both-hands drill, the
 * hand suggestHands gives the unmarked notes (taken as a line, notes on one beat as a chord).
 */
export function drillNoteHands(drill: DrillMusic): Hand[] {
  const hands = drill.notes.map(note => note.hand ?? (drill.hand === 'both' ? null : drill.hand))
  const open = drill.notes.map((note, index) => ({ note, index, midi: midiFromName(note.pitch) })).filter(({ index }) => hands[index] === null)
  if (open.length === 0) return hands as Hand[]
  const byBeat = new Map<number, typeof open>()
  for (const entry of open) byBeat.set(entry.note.beat, [...(byBeat.get(entry.note.beat) ?? []), entry])
  const groups = [...byBeat.entries()].sort((a, b) => a[0] - b[0]).map(([, group]) => group.sort((a, b) => a.midi - b.midi))
  const line: LineItem[] = groups.map(group => (group.length === 1 ? group[0]!.midi : group.map(e => e.midi)))
  const result = suggestHands({ notes: line })
  groups.forEach((group, g) => {
    const given = result.hands[g]!
    group.forEach((entry, j) => {
      hands[entry.index] = Array.isArray(given) ? given[j]! : given
    })
  })
  return hands as Hand[]
}

