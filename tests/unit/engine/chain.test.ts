import { describe, expect, it } from 'vitest'
import { optionPosteriors, pathCost, type Lattice } from '../../../shared/engine/chain'

/**
 * A small lattice of three-option items whose first and pair tables span `spread` cost units. Triple
 * terms come from an ergonomic model's tables, which span little, so they stay within 10.
 */
function lattice(items: number, spread: number): Lattice {
  const sizes = Array.from({ length: items }, () => 3)
  const table = (i: number, length: number, range: number): number[] => Array.from({ length }, (_, j) => range * (((i * 7 + j * 13) % 11) / 10))
  return { sizes, first: () => table(0, 3, spread), pair: i => table(i, 9, spread), triple: i => table(i + 100, 27, 10) }
}

/** Posteriors by summing over every path, in log space relative to the cheapest. */
function bruteForce(l: Lattice, temperature: number): number[][] {
  const n = l.sizes.length
  const paths: number[][] = []
  const walk = (path: number[]): void => {
    if (path.length === n) paths.push(path)
    else for (let o = 0; o < l.sizes[path.length]!; o++) walk([...path, o])
  }
  walk([])
  const logWeights = paths.map(p => -pathCost(l, p) / temperature)
  const top = Math.max(...logWeights)
  const weights = logWeights.map(w => Math.exp(w - top))
  const total = weights.reduce((a, b) => a + b, 0)
  const marginals = Array.from({ length: n }, (_, i) => Array.from({ length: l.sizes[i]! }, () => 0))
  paths.forEach((p, k) => p.forEach((o, i) => { marginals[i]![o]! += weights[k]! / total }))
  return marginals
}

describe('optionPosteriors', () => {
  // 10 cost units stay in the linear pass; 10,000 (5,000 temperatures, as an absurd chord's table may span) only log space can hold.
  it.each([10, 10_000])('matches the sum over every path when tables span %d cost units', (spread) => {
    const l = lattice(6, spread)
    const expected = bruteForce(l, 2)
    const posteriors = optionPosteriors(l, 2)
    expected.forEach((marginal, i) => marginal.forEach((p, o) => expect(posteriors.values[posteriors.start[i]! + o]).toBeCloseTo(p, 9)))
  })

  it('gives the same posteriors whatever a longer line left in the reused work arrays', () => {
    // The sum over every path (bruteForce) is the reference; a longer, different line run first leaves
    // its states in the work arrays the shorter one then reuses.
    const short = lattice(6, 10)
    const expected = bruteForce(short, 2)
    optionPosteriors(lattice(400, 30), 0.7)
    const posteriors = optionPosteriors(short, 2)
    expected.forEach((marginal, i) => marginal.forEach((p, o) => expect(posteriors.values[posteriors.start[i]! + o]).toBeCloseTo(p, 9)))
  })
})
