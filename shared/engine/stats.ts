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

/** Median of a non-empty list; null for an empty one. */
export function median(values: readonly number[]): number | null {
  if (values.length === 0) return null
  // A typed array sorts numerically without a comparator call per comparison.
  const sorted = new Float64Array(values).sort()
  const mid = sorted.length >> 1
  return sorted.length % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2
}
