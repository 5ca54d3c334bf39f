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

/** Onsets this close together are one chord (a common threshold for "played together"; our choice); the inference groups chords by the same window. */
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
/** Upper bound on DP cells (two bytes of moves each), so junk input cannot exhaust memory or time. */
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
    if (end === start + 1) {
      // Most notes are struck alone and need no group of their own.
      order.push(byOnset[start]!)
      start = end
      continue
    }
    const group = byOnset.slice(start, end).sort((a, b) => played[a]!.midi - played[b]!.midi || a - b)
    for (let k = 1; k < group.length; k++) grouped[order.length + k] = 1
    for (const index of group) order.push(index)
    start = end
  }
  return { order, grouped }
}

/**
 * Both sides in canonical order, as the programme reads them: made once for any number of alignments
 * that differ only in timing (grading aligns twice). Its fields are the module's own business.
 */
export interface AlignmentSides {
  /** Indices of the drill notes and of the played notes in canonical order. */
  targetOrder: number[]
  playedOrder: number[]
  tMidi: Int32Array
  pMidi: Int32Array
  tBeat: Float64Array
  pOn: Float64Array
  /** Whether a played note shares a chord-window group with the one before. */
  grouped: Uint8Array
  /**
   * The band, shared by every alignment of these sides: each fill writes every move it later reads, so
   * the second pass need not allocate (and the collector need not reclaim) a second set of moves.
   */
  band: Band
}

/** What a pass that compares intervals needs besides the sides. */
interface Tempo {
  /** Each drill note's written time in ms at the played tempo, in canonical order. */
  tMs: Float64Array
  /** Cost units per ms off. */
  perMs: number
}

/**
 * The programme's two layers over the band: the best cost of aligning the first i drill and j played
 * notes ending in a pairing (M) or in a missed or extra note (G), so that an interval is judged between
 * two pairings that really follow each other on the chosen path. G carries that path's last pairing
 * across the gap. Only the moves are kept for every cell (at rowStart[i] − lo[i] + j), for the
 * traceback; costs only for the last three rows (a crossing looks two rows back), in rings that each
 * fill makes for itself, row i at (i % 3) · ringWidth − lo[i], so that the rows the loop reads stay in
 * cache.
 */
interface Band {
  lo: Int32Array
  hi: Int32Array
  rowStart: Int32Array
  traceM: Uint8Array
  traceG: Uint8Array
  ringWidth: number
}

/** A value of each item in the given order (TypedArray.from with a mapping function is several times slower). */
function inOrder<A extends Int32Array | Float64Array>(out: A, order: readonly number[], value: (index: number) => number): A {
  for (let k = 0; k < order.length; k++) out[k] = value(order[k]!)
  return out
}

/** Where row i's costs start in the rings, offset so that cell j is at ringRow(band, i) + j. */
function ringRow(band: Band, i: number): number {
  return (i % 3) * band.ringWidth - band.lo[i]!
}

/** The cost of a played interval that is offMs longer or shorter than the written one. */
function timeCost(offMs: number, perMs: number): number {
  return Math.min(TIME_MAX, (Math.abs(offMs) * perMs + 0.5) | 0)
}

/** Whether drill notes i-2, i-1 (1-based i) may be matched crosswise with played notes j-2, j-1. */
function mayCross(sides: AlignmentSides, i: number, j: number): boolean {
  return sides.grouped[j - 1] === 1
    || (sides.tBeat[i - 1] === sides.tBeat[i - 2] && sides.pOn[j - 1]! - sides.pOn[j - 2]! <= HANDS_TOGETHER_MS)
}

/**
 * Whether cell (i, j) may be reached by matching drill notes i − 2, i − 1 crosswise with played notes
 * j − 2, j − 1 (1-based): each pitch answers the other's, the two differ, mayCross allows it, and the
 * cell two rows up lies in the band.
 */
function crossable(band: Band, sides: AlignmentSides, i: number, j: number): boolean {
  if (i < 2 || j < 2) return false
  const { tMidi, pMidi } = sides
  const midi = tMidi[i - 1]!
  const before = tMidi[i - 2]!
  return before !== -1 && midi === pMidi[j - 2] && before === pMidi[j - 1] && midi !== before
    && mayCross(sides, i, j) && j - 2 >= band.lo[i - 2]! && j - 2 <= band.hi[i - 2]!
}

/**
 * Fills both layers row by row, for a pass that compares intervals (fillUntimed does one that does
 * not). Kept apart from the other steps, with its helpers at module level, so that no closure captures
 * the arrays and the engine keeps them in registers over the hot loop. Every cell of the band is
 * written once (unreachable ones with INF), and the cell to the left is carried in locals rather than
 * read back: as the int32 it is stored as (`| 0`), since a tolerance far below a microsecond makes
 * time costs so large that sums wrap, and what is compared must be what would be read back. Returns
 * whether the traceback starts in the pairing layer.
 */
function fillBand(band: Band, sides: AlignmentSides, tempo: Tempo): boolean {
  const { lo, hi, rowStart, traceM, traceG, ringWidth } = band
  const { tMidi, pMidi, pOn } = sides
  const { tMs, perMs } = tempo
  const costM = new Int32Array(3 * ringWidth)
  const costG = new Int32Array(3 * ringWidth)
  const lastTargetG = new Int32Array(3 * ringWidth)
  const lastPlayedG = new Int32Array(3 * ringWidth)
  // The played interval into each note (from the one before), read by every row that pairs it.
  const playedStep = new Float64Array(pOn.length)
  for (let j = 1; j < pOn.length; j++) playedStep[j] = pOn[j]! - pOn[j - 1]!
  const top = ringRow(band, 0)
  for (let j = 0; j <= hi[0]!; j++) {
    costM[top + j] = INF
    costG[top + j] = j * GAP
    traceG[j] = LEFT_FROM_G
    lastTargetG[top + j] = -1
    lastPlayedG[top + j] = -1
  }
  // Row 0 has no pairing, so a pairing after it is judged against none.
  for (let i = 1; i < lo.length; i++) {
    const midi = tMidi[i - 1]!
    const trace = rowStart[i]! - lo[i]!
    const ring = ringRow(band, i)
    const first = lo[i]!
    const last = hi[i]!
    // Bands only move right, so the row above covers this row's start.
    const upRing = ringRow(band, i - 1)
    const upLo = lo[i - 1]!
    const upHi = hi[i - 1]!
    const atMs = tMs[i - 1]!
    // The written interval into this row's note, for a pairing straight after the one before.
    const writtenStep = i > 1 ? atMs - tMs[i - 2]! : 0
    let leftM = INF
    let leftG = INF
    let leftTarget = -1
    let leftPlayed = -1
    for (let j = first; j <= last; j++) {
      // G: a missed drill note (from above) or an extra played note (from the left), carrying the
      // last pairing across; on a tie the gap layer's path is kept, as the strict comparisons say.
      let g = INF
      let gTrace = 0
      let gTarget = -1
      let gPlayed = -1
      if (j <= upHi) {
        const up = upRing + j
        const fromM = costM[up]!
        const fromG = costG[up]!
        const cost = Math.min(fromM, fromG) + GAP
        if (cost < g) {
          g = cost | 0
          const m = fromM < fromG
          gTrace = m ? UP_FROM_M : UP_FROM_G
          gTarget = m ? i - 2 : lastTargetG[up]!
          gPlayed = m ? j - 1 : lastPlayedG[up]!
        }
      }
      let m = INF
      let mTrace = 0
      if (j > 0) {
        if (j > first) {
          const cost = Math.min(leftM, leftG) + GAP
          if (cost < g) {
            g = cost | 0
            const fromM = leftM < leftG
            gTrace = fromM ? LEFT_FROM_M : LEFT_FROM_G
            gTarget = fromM ? i - 1 : leftTarget
            gPlayed = fromM ? j - 2 : leftPlayed
          }
        }
        if (j - 1 >= upLo && j - 1 <= upHi) {
          const diagonal = upRing + j - 1
          const pitch = pMidi[j - 1] === midi ? 0 : SUBSTITUTE
          // The interval from the pairing before, on the straight path and across the gap.
          let timeM = 0
          let timeG = 0
          if (perMs > 0) {
            const onMs = pOn[j - 1]!
            if (i > 1 && j > 1) timeM = timeCost(playedStep[j - 1]! - writtenStep, perMs)
            const pa = lastTargetG[diagonal]!
            const pb = lastPlayedG[diagonal]!
            if (pa >= 0 && pb >= 0) timeG = timeCost(onMs - pOn[pb]! - (atMs - tMs[pa]!), perMs)
          }
          const fromM = costM[diagonal]! + pitch + timeM
          const fromG = costG[diagonal]! + pitch + timeG
          m = Math.min(fromM, fromG) | 0
          mTrace = fromM < fromG ? DIAGONAL_FROM_M : DIAGONAL_FROM_G
        }
        // Most cells fail the first test, so the rest is asked only of the few that pass it.
        if (j > 1 && pMidi[j - 2] === midi && crossable(band, sides, i, j)) {
          const crossed = ringRow(band, i - 2) + j - 2
          const fromM = costM[crossed]!
          const fromG = costG[crossed]!
          if (Math.min(fromM, fromG) < m) {
            m = Math.min(fromM, fromG)
            mTrace = fromM < fromG ? SWAP_FROM_M : SWAP_FROM_G
          }
        }
      }
      traceM[trace + j] = mTrace
      traceG[trace + j] = gTrace
      costM[ring + j] = m
      costG[ring + j] = g
      lastTargetG[ring + j] = gTarget
      lastPlayedG[ring + j] = gPlayed
      leftM = m
      leftG = g
      leftTarget = gTarget
      leftPlayed = gPlayed
    }
  }
  // The traceback starts in the pairing layer unless the gap layer is strictly cheaper at the end.
  const end = ringRow(band, lo.length - 1) + hi[lo.length - 1]!
  return costM[end]! <= costG[end]!
}

/**
 * The programme without timing, for the first pass. With no intervals to judge, what follows a cell
 * sees its two layers only through the cheaper cost of the two and whether the pairing layer is
 * strictly cheaper (every move out of a cell takes the minimum of its layers and names its source
 * layer by that comparison), so one cost and one flag per cell give the same moves as fillBand, with
 * less to carry and compare per cell. Returns whether the traceback starts in the pairing layer.
 */
function fillUntimed(band: Band, sides: AlignmentSides): boolean {
  const { lo, hi, rowStart, traceM, traceG, ringWidth } = band
  const { tMidi, pMidi } = sides
  const cost = new Int32Array(3 * ringWidth)
  const pairing = new Uint8Array(3 * ringWidth)
  const top = ringRow(band, 0)
  // Row 0 ends in gaps only (its pairing layer is unreachable), so its cost is the gaps'.
  for (let j = 0; j <= hi[0]!; j++) {
    cost[top + j] = j * GAP
    traceG[j] = LEFT_FROM_G
  }
  let endM = INF
  let endG = hi[0]! * GAP
  for (let i = 1; i < lo.length; i++) {
    const midi = tMidi[i - 1]!
    const trace = rowStart[i]! - lo[i]!
    const ring = ringRow(band, i)
    const first = lo[i]!
    const last = hi[i]!
    const upRing = ringRow(band, i - 1)
    const upLo = lo[i - 1]!
    const upHi = hi[i - 1]!
    let leftCost = INF
    let leftPairing = 0
    for (let j = first; j <= last; j++) {
      let g = INF
      let gTrace = 0
      if (j <= upHi) {
        const up = upRing + j
        if (cost[up]! + GAP < g) {
          g = cost[up]! + GAP
          gTrace = pairing[up] ? UP_FROM_M : UP_FROM_G
        }
      }
      let m = INF
      let mTrace = 0
      if (j > 0) {
        if (j > first && leftCost + GAP < g) {
          g = leftCost + GAP
          gTrace = leftPairing ? LEFT_FROM_M : LEFT_FROM_G
        }
        if (j - 1 >= upLo && j - 1 <= upHi) {
          const diagonal = upRing + j - 1
          m = cost[diagonal]! + (pMidi[j - 1] === midi ? 0 : SUBSTITUTE)
          mTrace = pairing[diagonal] ? DIAGONAL_FROM_M : DIAGONAL_FROM_G
        }
        // Most cells fail the first test, so the rest is asked only of the few that pass it.
        if (j > 1 && pMidi[j - 2] === midi && crossable(band, sides, i, j)) {
          const crossed = ringRow(band, i - 2) + j - 2
          if (cost[crossed]! < m) {
            m = cost[crossed]!
            mTrace = pairing[crossed] ? SWAP_FROM_M : SWAP_FROM_G
          }
        }
      }
      traceM[trace + j] = mTrace
      traceG[trace + j] = gTrace
      leftCost = Math.min(m, g)
      leftPairing = m < g ? 1 : 0
      cost[ring + j] = leftCost
      pairing[ring + j] = leftPairing
      endM = m
      endG = g
    }
  }
  return endM <= endG
}

export function alignNotes(targets: readonly AlignTarget[], played: readonly AlignPlayed[], options: AlignOptions = {}): Alignment {
  return alignSides(alignmentSides(targets, played, options.chordWindowMs), options)
}

export function alignmentSides(targets: readonly AlignTarget[], played: readonly AlignPlayed[], chordWindowMs = CHORD_WINDOW_MS): AlignmentSides {
  const ti = targetOrder(targets)
  const { order: pi, grouped } = playedOrder(played, chordWindowMs)
  return {
    targetOrder: ti,
    playedOrder: pi,
    tMidi: inOrder(new Int32Array(ti.length), ti, i => targets[i]!.midi),
    pMidi: inOrder(new Int32Array(pi.length), pi, i => played[i]!.midi),
    tBeat: inOrder(new Float64Array(ti.length), ti, i => targets[i]!.beat),
    pOn: inOrder(new Float64Array(pi.length), pi, i => played[i]!.onMs),
    grouped,
    band: bandFor(ti.length, pi.length),
  }
}

/** The alignment of prepared sides; intervals are compared when the timing gives a tempo. */
export function alignSides(sides: AlignmentSides, timing: Pick<AlignOptions, 'msPerBeat' | 'toleranceMs'> = {}): Alignment {
  const { msPerBeat, toleranceMs } = timing
  const { band } = sides
  if (msPerBeat === undefined || !(msPerBeat > 0)) return traceBack(band, sides, fillUntimed(band, sides))
  const tMs = new Float64Array(sides.tBeat.length)
  for (let k = 0; k < tMs.length; k++) tMs[k] = sides.tBeat[k]! * msPerBeat
  const perMs = TIME_MAX / (toleranceMs && toleranceMs > 0 ? toleranceMs : msPerBeat)
  return traceBack(band, sides, fillBand(band, sides, { tMs, perMs }))
}

/** The band around the diagonal for n drill and m played notes, its rings and moves not yet filled. */
function bandFor(n: number, m: number): Band {
  const rows = n + 1
  const width = Math.max(1, Math.min(Math.abs(n - m) + BAND_MARGIN, Math.floor(MAX_CELLS / rows / 2)))
  const lo = new Int32Array(rows)
  const hi = new Int32Array(rows)
  const rowStart = new Int32Array(rows + 1)
  let ringWidth = 0
  for (let i = 0; i <= n; i++) {
    const centre = n === 0 ? 0 : Math.round((i * m) / n)
    lo[i] = i === 0 ? 0 : Math.max(0, centre - width)
    hi[i] = i === n ? m : Math.min(m, centre + width)
    rowStart[i + 1] = rowStart[i]! + hi[i]! - lo[i]! + 1
    ringWidth = Math.max(ringWidth, hi[i]! - lo[i]! + 1)
  }
  const cells = rowStart[rows]!
  return {
    lo,
    hi,
    rowStart,
    traceM: new Uint8Array(cells),
    traceG: new Uint8Array(cells),
    ringWidth,
  }
}

/** Follows the moves back from (drill, played), starting in the given layer, pairing notes and collecting extras. */
function traceBack(band: Band, sides: AlignmentSides, startInM: boolean): Alignment {
  const { lo, rowStart, traceM, traceG } = band
  const n = sides.targetOrder.length
  const alignment: Alignment = {
    match: new Array<number | null>(n).fill(null),
    outcome: new Array<AlignOutcome>(n).fill('missed'),
    extras: [],
    counts: { correct: 0, wrong: 0, extra: 0, missed: 0 },
  }
  let i = n
  let j = sides.playedOrder.length
  let inM = startInM
  while (i > 0 || j > 0) {
    const here = rowStart[i]! - lo[i]! + j
    if (inM) {
      const move = traceM[here]!
      if (move === SWAP_FROM_M || move === SWAP_FROM_G) {
        pairUp(sides, alignment, i - 1, j - 2)
        pairUp(sides, alignment, i - 2, j - 1)
        i -= 2
        j -= 2
      }
      else {
        pairUp(sides, alignment, i - 1, j - 1)
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
        alignment.extras.push(sides.playedOrder[j - 1]!)
        j--
      }
      inM = move === UP_FROM_M || move === LEFT_FROM_M
    }
  }
  // Extras were met last first.
  alignment.extras.reverse()
  const { counts } = alignment
  counts.extra = alignment.extras.length
  counts.missed = n - counts.correct - counts.wrong
  return alignment
}

/** Records drill note t as answered by played note p (canonical indices). */
function pairUp(sides: AlignmentSides, alignment: Alignment, t: number, p: number): void {
  const target = sides.targetOrder[t]!
  const correct = sides.tMidi[t] === sides.pMidi[p]
  alignment.match[target] = sides.playedOrder[p]!
  alignment.outcome[target] = correct ? 'correct' : 'wrong'
  if (correct) alignment.counts.correct++
  else alignment.counts.wrong++
}
