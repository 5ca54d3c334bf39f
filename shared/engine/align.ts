// Which played note answers which drill note: an edit-distance alignment over pitch and order.
//
// Both sides are brought into one canonical order first: drill notes by beat and then pitch,
// played notes by onset, with notes struck within a small window (a chord) re-ordered by pitch.
// The order inside a chord is therefore free, while the order of everything else counts. Two
// single notes struck within that window (a rushed note) may then sit in the wrong order, so
// the programme may also match such a pair crosswise at no cost, as it may two notes the drill
// puts on one beat that were struck up to HANDS_TOGETHER_MS apart (hands not quite together).
// Costs: same pitch 0, a wrong pitch in the drill note's place SUBSTITUTE, a missed or an extra
// note GAP each. SUBSTITUTE < 2 × GAP makes a wrong note cheaper than "missed + extra", and
// SUBSTITUTE > GAP lets one gap buy back a run of matches after a skipped or added note.
//
// The dynamic programme runs in a band around the diagonal from (0, 0) to (drill, played),
// wide enough for the length difference plus a margin, so a 100,000-note attempt needs
// O(n · band) time and memory instead of O(n²).

export interface AlignTarget { midi: number, beat: number }
export interface AlignPlayed { midi: number, onMs: number }

export type AlignOutcome = 'correct' | 'wrong' | 'missed'

export interface Alignment {
  /** Per target, in input order: the index of the played note matched to it, or null. */
  match: (number | null)[]
  outcome: AlignOutcome[]
  /** Indices of played notes that answer no target, in onset order. */
  extras: number[]
  counts: { correct: number, wrong: number, extra: number, missed: number }
}

export interface AlignOptions {
  /** Played notes whose onsets lie within this many ms of a group's first onset count as one chord. */
  chordWindowMs?: number
}

/** Same window the inference uses for chords, so both modules see the same groups. */
export const CHORD_WINDOW_MS = 30
/**
 * Two notes the drill writes on one beat (often one in each hand) may be struck this far apart
 * and still count in either order: hands "together" drift apart by tens of ms (from memory).
 */
const HANDS_TOGETHER_MS = 100

const SUBSTITUTE = 3
const GAP = 2
/** Extra band width beyond the length difference: room for local detours (a skipped or added run). */
const BAND_MARGIN = 32
/** Upper bound on DP cells (5 bytes each: cost and traceback), so junk input cannot exhaust memory. */
const MAX_CELLS = 10_000_000
const INF = 0x3fffffff

const DIAGONAL = 0
const UP = 1 // target missed
const LEFT = 2 // played note extra
const SWAP = 3 // two notes struck within the chord window, matched crosswise

function targetOrder(targets: readonly AlignTarget[]): number[] {
  return targets.map((_, i) => i).sort((a, b) => targets[a]!.beat - targets[b]!.beat || targets[a]!.midi - targets[b]!.midi || a - b)
}

/** Played notes in canonical order, and for each whether it shares a chord-window group with the one before. */
function playedOrder(played: readonly AlignPlayed[], windowMs: number): { order: number[], grouped: Uint8Array } {
  const byOnset = played.map((_, i) => i).sort((a, b) => played[a]!.onMs - played[b]!.onMs || a - b)
  const order: number[] = []
  const grouped = new Uint8Array(played.length)
  let start = 0
  while (start < byOnset.length) {
    const first = played[byOnset[start]!]!.onMs
    let end = start + 1
    while (end < byOnset.length && played[byOnset[end]!]!.onMs - first <= windowMs) end++
    const group = byOnset.slice(start, end).sort((a, b) => played[a]!.midi - played[b]!.midi || a - b)
    for (let k = 1; k < group.length; k++) grouped[order.length + k] = 1
    for (const index of group) order.push(index)
    start = end
  }
  return { order, grouped }
}

export function alignNotes(targets: readonly AlignTarget[], played: readonly AlignPlayed[], options: AlignOptions = {}): Alignment {
  const ti = targetOrder(targets)
  const { order: pi, grouped } = playedOrder(played, options.chordWindowMs ?? CHORD_WINDOW_MS)
  const n = ti.length
  const m = pi.length
  const tMidi = Int32Array.from(ti, i => targets[i]!.midi)
  const pMidi = Int32Array.from(pi, i => played[i]!.midi)
  const tBeat = Float64Array.from(ti, i => targets[i]!.beat)
  const pOn = Float64Array.from(pi, i => played[i]!.onMs)
  /** Whether drill notes i-2, i-1 (1-based i) may be matched crosswise with played notes j-2, j-1. */
  const mayCross = (i: number, j: number): boolean => grouped[j - 1] === 1
    || (tBeat[i - 1] === tBeat[i - 2] && pOn[j - 1]! - pOn[j - 2]! <= HANDS_TOGETHER_MS)

  const rows = n + 1
  const width = Math.max(1, Math.min(Math.abs(n - m) + BAND_MARGIN, Math.floor(MAX_CELLS / rows / 2)))
  const lo = new Int32Array(rows)
  const hi = new Int32Array(rows)
  const rowStart = new Int32Array(rows + 1)
  for (let i = 0; i <= n; i++) {
    const centre = n === 0 ? 0 : Math.round((i * m) / n)
    lo[i] = i === 0 ? 0 : Math.max(0, centre - width)
    hi[i] = i === n ? m : Math.min(m, centre + width)
    rowStart[i + 1] = rowStart[i]! + hi[i]! - lo[i]! + 1
  }
  const cells = rowStart[rows]!
  const cost = new Int32Array(cells)
  const trace = new Uint8Array(cells)
  const at = (i: number, j: number): number => (j < lo[i]! || j > hi[i]! ? INF : cost[rowStart[i]! - lo[i]! + j]!)

  for (let j = 0; j <= hi[0]!; j++) {
    cost[j] = j * GAP
    trace[j] = LEFT
  }
  for (let i = 1; i <= n; i++) {
    const base = rowStart[i]! - lo[i]!
    const lo0 = lo[i]!
    // The row above, read directly: its band starts no later and ends no later than this one's.
    const upBase = rowStart[i - 1]! - lo[i - 1]!
    const upLo = lo[i - 1]!
    const upHi = hi[i - 1]!
    const midi = tMidi[i - 1]!
    const before = i > 1 ? tMidi[i - 2]! : -1
    for (let j = lo0; j <= hi[i]!; j++) {
      let best = (j <= upHi ? cost[upBase + j]! : INF) + GAP
      let move = UP
      if (j > 0) {
        const diagonal = (j - 1 >= upLo && j - 1 <= upHi ? cost[upBase + j - 1]! : INF) + (pMidi[j - 1] === midi ? 0 : SUBSTITUTE)
        if (diagonal <= best) {
          best = diagonal
          move = DIAGONAL
        }
        if (j > lo0) {
          const left = cost[base + j - 1]! + GAP
          if (left < best) {
            best = left
            move = LEFT
          }
        }
        if (before !== -1 && midi === pMidi[j - 2] && before === pMidi[j - 1] && midi !== before && mayCross(i, j)) {
          const crossed = at(i - 2, j - 2)
          if (crossed < best) {
            best = crossed
            move = SWAP
          }
        }
      }
      cost[base + j] = best
      trace[base + j] = move
    }
  }

  const match: (number | null)[] = Array.from({ length: targets.length }, () => null)
  const outcome: AlignOutcome[] = Array.from({ length: targets.length }, () => 'missed')
  const pair = (ti1: number, pj1: number): void => {
    const target = ti[ti1]!
    match[target] = pi[pj1]!
    outcome[target] = tMidi[ti1] === pMidi[pj1] ? 'correct' : 'wrong'
  }
  const extrasReversed: number[] = []
  let i = n
  let j = m
  while (i > 0 || j > 0) {
    const move = i === 0 ? LEFT : j < lo[i]! || j > hi[i]! ? UP : trace[rowStart[i]! - lo[i]! + j]!
    if (move === DIAGONAL) {
      pair(i - 1, j - 1)
      i--
      j--
    }
    else if (move === SWAP) {
      pair(i - 1, j - 2)
      pair(i - 2, j - 1)
      i -= 2
      j -= 2
    }
    else if (move === UP) {
      i--
    }
    else {
      extrasReversed.push(pi[j - 1]!)
      j--
    }
  }

  const counts = { correct: 0, wrong: 0, extra: extrasReversed.length, missed: 0 }
  for (const o of outcome) counts[o]++
  return { match, outcome, extras: extrasReversed.reverse(), counts }
}
