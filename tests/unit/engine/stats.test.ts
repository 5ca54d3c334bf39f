import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { linearRegression, standardDeviation as ssStandardDeviation, mean as ssMean, median as ssMedian } from 'simple-statistics'
import { leastSquaresLine, mean, median, standardDeviation } from '../../../shared/engine/stats'

const values = fc.array(fc.double({ min: -1e4, max: 1e4, noNaN: true }), { minLength: 1, maxLength: 60 })

describe('statistics against simple-statistics', () => {
  // Reference: simple-statistics (npm) mean, standardDeviation (population), median.
  it('mean, SD and median agree on random data', () => {
    fc.assert(fc.property(values, (xs) => {
      expect(mean(xs)).toBeCloseTo(ssMean(xs), 6)
      expect(standardDeviation(xs)).toBeCloseTo(ssStandardDeviation(xs), 6)
      expect(median(xs)).toBeCloseTo(ssMedian(xs), 9)
    }))
  })

  // Reference: simple-statistics (npm) linearRegression ({ m, b }).
  it('the least-squares line agrees with linearRegression', () => {
    const points = fc.array(fc.tuple(fc.integer({ min: 0, max: 2000 }), fc.double({ min: -1e5, max: 1e5, noNaN: true })), { minLength: 2, maxLength: 60 })
      .filter(ps => new Set(ps.map(p => p[0])).size > 1)
    fc.assert(fc.property(points, (ps) => {
      const line = leastSquaresLine(ps.map(p => p[0]), ps.map(p => p[1]))
      const ref = linearRegression(ps)
      expect(line).not.toBeNull()
      expect(line!.slope).toBeCloseTo(ref.m, 4)
      expect(line!.intercept).toBeCloseTo(ref.b, 2)
    }))
  })

  it('finds the median by selection as a full sort would, on ordered, reversed, repeated and peaked lists', () => {
    const sortedMedian = (xs: number[]): number => {
      const s = [...xs].sort((a, b) => a - b)
      return s.length % 2 ? s[s.length >> 1]! : (s[(s.length >> 1) - 1]! + s[s.length >> 1]!) / 2
    }
    for (const n of [1, 2, 3, 64, 65, 1000, 1001]) {
      const lists = [
        Array.from({ length: n }, (_, k) => k),
        Array.from({ length: n }, (_, k) => n - k),
        Array.from({ length: n }, (_, k) => k % 3),
        Array.from({ length: n }, (_, k) => Math.min(k, n - k)),
      ]
      for (const xs of lists) expect(median(xs)).toBe(sortedMedian(xs))
    }
  })

  it('returns null where there is nothing to compute', () => {
    expect(mean([])).toBeNull()
    expect(standardDeviation([])).toBeNull()
    expect(median([])).toBeNull()
    expect(leastSquaresLine([1, 1], [2, 3])).toBeNull()
  })
})
