// The few statistics grading needs, written out so the hot path allocates nothing and an empty
// input yields null instead of a thrown error (tests hold them against simple-statistics).

export function mean(values: readonly number[]): number | null {
  if (values.length === 0) return null
  let sum = 0
  for (let k = 0; k < values.length; k++) sum += values[k]!
  return sum / values.length
}

/** Population standard deviation (divides by n), the convention of simple-statistics' standardDeviation. */
export function standardDeviation(values: readonly number[]): number | null {
  const m = mean(values)
  if (m === null) return null
  let squares = 0
  for (let k = 0; k < values.length; k++) squares += (values[k]! - m) ** 2
  return Math.sqrt(squares / values.length)
}

export interface Line {
  /** Change of y per unit of x. */
  slope: number
  /** y at x = 0. */
  intercept: number
}

/** Ordinary least-squares line through (xs[i], ys[i]); null when x does not vary. */
export function leastSquaresLine(xs: readonly number[], ys: readonly number[]): Line | null {
  const n = Math.min(xs.length, ys.length)
  if (n === 0) return null
  let sx = 0
  let sy = 0
  for (let i = 0; i < n; i++) {
    sx += xs[i]!
    sy += ys[i]!
  }
  const mx = sx / n
  const my = sy / n
  // Centred sums keep precision when x and y are large (onsets an hour into an attempt).
  let sxx = 0
  let sxy = 0
  for (let i = 0; i < n; i++) {
    const dx = xs[i]! - mx
    sxx += dx * dx
    sxy += dx * (ys[i]! - my)
  }
  if (sxx === 0) return null
  const slope = sxy / sxx
  return { slope, intercept: my - slope * mx }
}

/** Median of a non-empty list of finite numbers; null for an empty one. */
export function median(values: readonly number[]): number | null {
  if (values.length === 0) return null
  const copy = new Float64Array(values)
  const mid = copy.length >> 1
  const upper = select(copy, mid)
  if (copy.length % 2) return upper
  // Selection leaves every value before `mid` no larger, so the lower middle is the largest of them.
  let lower = copy[0]!
  for (let k = 1; k < mid; k++) lower = Math.max(lower, copy[k]!)
  return (lower + upper) / 2
}

/** Partition rounds after which selection gives up on its pivots and sorts what is left. */
const SELECT_ROUNDS = 64

/**
 * The k-th smallest value (0-based), leaving no larger value before index k: quickselect, linear on
 * average where sorting is not. Input chosen to keep the pivots lopsided cannot make it quadratic,
 * since after SELECT_ROUNDS partitions the rest is sorted.
 */
function select(values: Float64Array, k: number): number {
  let lo = 0
  let hi = values.length - 1
  for (let round = 0; lo < hi; round++) {
    if (round === SELECT_ROUNDS) {
      values.subarray(lo, hi + 1).sort()
      break
    }
    const pivot = values[(lo + hi) >> 1]!
    let i = lo
    let j = hi
    while (i <= j) {
      while (values[i]! < pivot) i++
      while (values[j]! > pivot) j--
      if (i <= j) {
        const swap = values[i]!
        values[i++] = values[j]!
        values[j--] = swap
      }
    }
    // Now [lo, j] holds values up to the pivot, [i, hi] values from it, and anything between equals it.
    if (k <= j) hi = j
    else if (k >= i) lo = i
    else break
  }
  return values[k]!
}
