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
// Given the beat's length in ms (grading passes the tempo of a first alignment), two pairings
// in a row also cost up to TIME_MAX when the played interval between them differs from the
// written one. TIME_MAX is small beside GAP and SUBSTITUTE, so time mostly settles what pitch
// and order leave open: which of two repeated keys was the missed one (where the long gap is),
// or which of a doubled note answers the drill. Intervals, not onsets against one fitted line,
// so that a gradual change of tempo costs nothing.
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
  /** The played tempo as ms per beat; intervals are not compared when absent. */
  msPerBeat?: number
  /** How far an interval may be off (ms) before it costs the full TIME_MAX; typically one note step. */
  toleranceMs?: number
}

/** Same window the inference uses for chords, so both modules see the same groups. */
export const CHORD_WINDOW_MS = 30
/**
 * Two notes the drill writes on one beat (often one in each hand) may be struck this far apart
 * and still count in either order: hands "together" drift apart by tens of ms (from memory).
 */
const HANDS_TOGETHER_MS = 100

const SUBSTITUTE = 30
const GAP = 20
const TIME_MAX = 9
/** Extra band width beyond the length difference: room for local detours (a skipped or added run). */
const BAND_MARGIN = 32
/** Upper bound on DP cells (18 bytes each: costs, tracebacks, last pairings), so junk input cannot exhaust memory. */
const MAX_CELLS = 4_000_000
const INF = 0x0fffffff

// How a cell was reached. Pairings: straight on, or two notes matched crosswise (SWAP);
// gaps: a missed drill note (UP) or an extra played note (LEFT); each from either layer.
const DIAGONAL_FROM_M = 0
const DIAGONAL_FROM_G = 1
const SWAP_FROM_M = 2
const SWAP_FROM_G = 3
const UP_FROM_M = 0
const UP_FROM_G = 1
const LEFT_FROM_M = 2
const LEFT_FROM_G = 3

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

/** Both sides in canonical order, as the programme reads them. */
interface Lines {
  tMidi: Int32Array
  pMidi: Int32Array
  tBeat: Float64Array
  pOn: Float64Array
  /** Each drill note's written time in ms at the played tempo (all 0 without one). */
  tMs: Float64Array
  /** Cost units per ms off; 0 when intervals are not compared. */
  perMs: number
  /** Whether a played note shares a chord-window group with the one before. */
  grouped: Uint8Array
}

/**
 * The programme's two layers over the band, cell (i, j) at rowStart[i] − lo[i] + j: the best cost of
 * aligning the first i drill and j played notes ending in a pairing (M) or in a missed or extra note
 * (G), so that an interval is judged between two pairings that really follow each other on the chosen
 * path. G carries that path's last pairing across the gap.
 */
interface Band {
  lo: Int32Array
  hi: Int32Array
  rowStart: Int32Array
  costM: Int32Array
  costG: Int32Array
  traceM: Uint8Array
  traceG: Uint8Array
  lastTargetG: Int32Array
  lastPlayedG: Int32Array
}

/** A value of each item in the given order (TypedArray.from with a mapping function is several times slower). */
function inOrder<A extends Int32Array | Float64Array>(out: A, order: readonly number[], value: (index: number) => number): A {
  for (let k = 0; k < order.length; k++) out[k] = value(order[k]!)
  return out
}

function cellOf(band: Band, i: number, j: number): number {
  return j < band.lo[i]! || j > band.hi[i]! ? -1 : band.rowStart[i]! - band.lo[i]! + j
}

/** Off-time cost of pairing drill note a with played note b after the pairing pa–pb (0-based canonical indices). */
function offTime(lines: Lines, a: number, b: number, pa: number, pb: number): number {
  if (lines.perMs === 0 || pa < 0 || pb < 0) return 0
  const off = Math.abs(lines.pOn[b]! - lines.pOn[pb]! - (lines.tMs[a]! - lines.tMs[pa]!))
  return Math.min(TIME_MAX, (off * lines.perMs + 0.5) | 0)
}

/** Whether drill notes i-2, i-1 (1-based i) may be matched crosswise with played notes j-2, j-1. */
function mayCross(lines: Lines, i: number, j: number): boolean {
  return lines.grouped[j - 1] === 1
    || (lines.tBeat[i - 1] === lines.tBeat[i - 2] && lines.pOn[j - 1]! - lines.pOn[j - 2]! <= HANDS_TOGETHER_MS)
}

/** Enter G at `here` from cell `from`, whose own pairing, if it ends in one, is drill note fromTarget with played note fromPlayed. */
function enterGap(band: Band, here: number, from: number, fromTarget: number, fromPlayed: number, up: boolean): void {
  const fromM = band.costM[from]!
  const fromG = band.costG[from]!
  const cost = Math.min(fromM, fromG) + GAP
  if (cost < band.costG[here]!) {
    band.costG[here] = cost
    const m = fromM < fromG
    band.traceG[here] = up ? (m ? UP_FROM_M : UP_FROM_G) : (m ? LEFT_FROM_M : LEFT_FROM_G)
    band.lastTargetG[here] = m ? fromTarget : band.lastTargetG[from]!
    band.lastPlayedG[here] = m ? fromPlayed : band.lastPlayedG[from]!
  }
}

/**
 * Fills both layers row by row. Kept apart from alignNotes, with its helpers at module level, so that
 * no closure captures the arrays and the engine keeps them in registers over the hot loop.
 */
function fillBand(band: Band, lines: Lines): void {
  const { lo, hi, rowStart, costM, costG, traceM, lastTargetG, lastPlayedG } = band
  const { tMidi, pMidi } = lines
  for (let j = 0; j <= hi[0]!; j++) {
    costG[j] = j * GAP
    band.traceG[j] = LEFT_FROM_G
  }
  // Row 0 has no pairing, so a pairing after it is judged against none.
  for (let i = 1; i < lo.length; i++) {
    const midi = tMidi[i - 1]!
    const before = i > 1 ? tMidi[i - 2]! : -1
    const base = rowStart[i]! - lo[i]!
    const first = lo[i]!
    const last = hi[i]!
    // Bands only move right, so the row above covers this row's start.
    const upBase = rowStart[i - 1]! - lo[i - 1]!
    const upLo = lo[i - 1]!
    const upHi = hi[i - 1]!
    for (let j = first; j <= last; j++) {
      const here = base + j
      if (j <= upHi) enterGap(band, here, upBase + j, i - 2, j - 1, true)
      if (j === 0) continue
      if (j > first) enterGap(band, here, here - 1, i - 1, j - 2, false)
      if (j - 1 >= upLo && j - 1 <= upHi) {
        const diagonal = upBase + j - 1
        const pitch = pMidi[j - 1] === midi ? 0 : SUBSTITUTE
        const fromM = costM[diagonal]! + pitch + offTime(lines, i - 1, j - 1, i - 2, j - 2)
        const fromG = costG[diagonal]! + pitch + offTime(lines, i - 1, j - 1, lastTargetG[diagonal]!, lastPlayedG[diagonal]!)
        costM[here] = Math.min(fromM, fromG)
        traceM[here] = fromM < fromG ? DIAGONAL_FROM_M : DIAGONAL_FROM_G
      }
      if (j > 1 && before !== -1 && midi === pMidi[j - 2] && before === pMidi[j - 1] && midi !== before && mayCross(lines, i, j)) {
        const crossed = cellOf(band, i - 2, j - 2)
        if (crossed >= 0) {
          const fromM = costM[crossed]!
          const fromG = costG[crossed]!
          if (Math.min(fromM, fromG) < costM[here]!) {
            costM[here] = Math.min(fromM, fromG)
            traceM[here] = fromM < fromG ? SWAP_FROM_M : SWAP_FROM_G
          }
        }
      }
    }
  }
}

export function alignNotes(targets: readonly AlignTarget[], played: readonly AlignPlayed[], options: AlignOptions = {}): Alignment {
  const ti = targetOrder(targets)
  const { order: pi, grouped } = playedOrder(played, options.chordWindowMs ?? CHORD_WINDOW_MS)
  const n = ti.length
  const m = pi.length
  const tMidi = inOrder(new Int32Array(n), ti, i => targets[i]!.midi)
  const pMidi = inOrder(new Int32Array(m), pi, i => played[i]!.midi)
  const tBeat = inOrder(new Float64Array(n), ti, i => targets[i]!.beat)
  const pOn = inOrder(new Float64Array(m), pi, i => played[i]!.onMs)
  const timed = options.msPerBeat !== undefined && options.msPerBeat > 0
  const lines: Lines = {
    tMidi,
    pMidi,
    tBeat,
    pOn,
    // Each drill note's written time in ms at the played tempo, and cost units per ms off.
    tMs: tBeat.map(b => b * (timed ? options.msPerBeat! : 0)),
    perMs: timed ? TIME_MAX / (options.toleranceMs && options.toleranceMs > 0 ? options.toleranceMs : options.msPerBeat!) : 0,
    grouped,
  }

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
  const band: Band = {
    lo,
    hi,
    rowStart,
    costM: new Int32Array(cells).fill(INF),
    costG: new Int32Array(cells).fill(INF),
    traceM: new Uint8Array(cells),
    traceG: new Uint8Array(cells),
    lastTargetG: new Int32Array(cells).fill(-1),
    lastPlayedG: new Int32Array(cells).fill(-1),
  }
  fillBand(band, lines)
  const { costM, costG, traceM, traceG } = band
  const cell = (i: number, j: number): number => cellOf(band, i, j)

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
  const last = cell(n, m)
  let inM = costM[last]! <= costG[last]!
  while (i > 0 || j > 0) {
    const here = cell(i, j)
    if (inM) {
      const move = traceM[here]!
      if (move === SWAP_FROM_M || move === SWAP_FROM_G) {
        pair(i - 1, j - 2)
        pair(i - 2, j - 1)
        i -= 2
        j -= 2
      }
      else {
        pair(i - 1, j - 1)
        i--
        j--
      }
      inM = move === DIAGONAL_FROM_M || move === SWAP_FROM_M
    }
    else {
      const move = traceG[here]!
      if (move === UP_FROM_M || move === UP_FROM_G) {
        i--
      }
      else {
        extrasReversed.push(pi[j - 1]!)
        j--
      }
      inM = move === UP_FROM_M || move === LEFT_FROM_M
    }
  }

  const counts = { correct: 0, wrong: 0, extra: extrasReversed.length, missed: 0 }
  for (const o of outcome) counts[o]++
  return { match, outcome, extras: extrasReversed.reverse(), counts }
}
