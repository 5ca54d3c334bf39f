// Second-order chain search shared by suggestion (cheapest path) and inference (most probable path, posteriors).
// A state is the pair (option at the previous item, option at this item), so rules over three
// consecutive notes apply exactly while the work stays linear in the length of the line.

/** Costs of a line of items, each with a few options (fingers, or finger assignments for chords). */
export interface Lattice {
  /** Number of options of each item (at least 1). */
  sizes: ArrayLike<number>
  /** Cost of each option of item 0. */
  first(): ArrayLike<number>
  /** Cost of option c at item i after option b at item i − 1, at [b · sizes[i] + c] (i ≥ 1). */
  pair(i: number): ArrayLike<number>
  /** Extra cost over items i − 2, i − 1, i at [(a · sizes[i − 1] + b) · sizes[i] + c], or null when there is none (i ≥ 2). */
  triple(i: number): ArrayLike<number> | null
}

export interface ChainPath {
  /** The chosen option of each item. */
  path: number[]
  cost: number
}

function argmin(values: ArrayLike<number>, length: number): number {
  let best = 0
  for (let i = 1; i < length; i++) if (values[i]! < values[best]!) best = i
  return best
}

/** The cheapest path (Viterbi over state pairs). */
export function cheapestPath(lattice: Lattice): ChainPath {
  const n = lattice.sizes.length
  if (n === 0) return { path: [], cost: 0 }
  const first = lattice.first()
  const s0 = lattice.sizes[0]!
  if (n === 1) {
    const best = argmin(first, s0)
    return { path: [best], cost: first[best]! }
  }
  let maxSize = 1
  let backLength = 0
  const offsets = new Int32Array(n)
  for (let i = 0; i < n; i++) {
    maxSize = Math.max(maxSize, lattice.sizes[i]!)
    if (i >= 2) {
      offsets[i] = backLength
      backLength += lattice.sizes[i - 1]! * lattice.sizes[i]!
    }
  }
  const back = new Int8Array(backLength)
  let prev = new Float64Array(maxSize * maxSize)
  let next = new Float64Array(maxSize * maxSize)
  const s1 = lattice.sizes[1]!
  const pair1 = lattice.pair(1)
  for (let b = 0; b < s0; b++) {
    for (let c = 0; c < s1; c++) prev[b * s1 + c] = first[b]! + pair1[b * s1 + c]!
  }
  for (let i = 2; i < n; i++) {
    const sa = lattice.sizes[i - 2]!
    const sb = lattice.sizes[i - 1]!
    const sc = lattice.sizes[i]!
    const pair = lattice.pair(i)
    const triple = lattice.triple(i)
    const offset = offsets[i]!
    for (let b = 0; b < sb; b++) {
      for (let c = 0; c < sc; c++) {
        let best = Infinity
        let bestA = 0
        for (let a = 0; a < sa; a++) {
          const v = prev[a * sb + b]! + (triple ? triple[(a * sb + b) * sc + c]! : 0)
          if (v < best) {
            best = v
            bestA = a
          }
        }
        next[b * sc + c] = best + pair[b * sc + c]!
        back[offset + b * sc + c] = bestA
      }
    }
    const swap = prev
    prev = next
    next = swap
  }
  const sb = lattice.sizes[n - 2]!
  const sc = lattice.sizes[n - 1]!
  const last = argmin(prev, sb * sc)
  const path = new Array<number>(n)
  path[n - 1] = last % sc
  path[n - 2] = Math.floor(last / sc)
  for (let i = n - 1; i >= 2; i--) {
    path[i - 2] = back[offsets[i]! + path[i - 1]! * lattice.sizes[i]! + path[i]!]!
  }
  return { path, cost: prev[last]! }
}

/** The total cost of one path through the lattice. */
export function pathCost(lattice: Lattice, path: number[]): number {
  let total = 0
  for (let i = 0; i < path.length; i++) {
    const c = path[i]!
    if (i === 0) {
      total += lattice.first()[c]!
      continue
    }
    const sc = lattice.sizes[i]!
    const b = path[i - 1]!
    total += lattice.pair(i)[b * sc + c]!
    const triple = i >= 2 ? lattice.triple(i) : null
    if (triple) total += triple[(path[i - 2]! * lattice.sizes[i - 1]! + b) * sc + c]!
  }
  return total
}

function logSumExp(values: Float64Array, length: number): number {
  let max = -Infinity
  for (let i = 0; i < length; i++) if (values[i]! > max) max = values[i]!
  if (max === -Infinity || !Number.isFinite(max)) return max
  let sum = 0
  for (let i = 0; i < length; i++) sum += Math.exp(values[i]! - max)
  return max + Math.log(sum)
}

/**
 * Posterior probability of every option of every item when a path's probability is proportional to
 * exp(−cost / temperature) (forward–backward over the same state pairs).
 */
export function optionPosteriors(lattice: Lattice, temperature: number): Float64Array[] {
  const n = lattice.sizes.length
  if (n === 0) return []
  const size = (i: number): number => lattice.sizes[i]!
  const first = lattice.first()
  const alpha: Float64Array[] = []
  const a0 = new Float64Array(size(0))
  for (let c = 0; c < size(0); c++) a0[c] = -first[c]! / temperature
  alpha.push(a0)
  let maxSize = 1
  for (let i = 0; i < n; i++) maxSize = Math.max(maxSize, size(i))
  const scratch = new Float64Array(maxSize)
  for (let i = 1; i < n; i++) {
    const sb = size(i - 1)
    const sc = size(i)
    const pair = lattice.pair(i)
    const here = new Float64Array(sb * sc)
    if (i === 1) {
      for (let b = 0; b < sb; b++) for (let c = 0; c < sc; c++) here[b * sc + c] = a0[b]! - pair[b * sc + c]! / temperature
    }
    else {
      const sa = size(i - 2)
      const triple = lattice.triple(i)
      const before = alpha[i - 1]!
      for (let b = 0; b < sb; b++) {
        for (let c = 0; c < sc; c++) {
          for (let a = 0; a < sa; a++) scratch[a] = before[a * sb + b]! - (triple ? triple[(a * sb + b) * sc + c]! : 0) / temperature
          here[b * sc + c] = logSumExp(scratch, sa) - pair[b * sc + c]! / temperature
        }
      }
    }
    alpha.push(here)
  }
  // beta[i] has the shape of alpha[i]: the log weight of everything after item i given its state.
  const beta: Float64Array[] = new Array(n)
  beta[n - 1] = new Float64Array(alpha[n - 1]!.length)
  for (let i = n - 1; i >= 1; i--) {
    const sb = size(i - 1)
    const sc = size(i)
    const pair = lattice.pair(i)
    const after = beta[i]!
    if (i === 1) {
      const b0 = new Float64Array(sb)
      for (let b = 0; b < sb; b++) {
        for (let c = 0; c < sc; c++) scratch[c] = -pair[b * sc + c]! / temperature + after[b * sc + c]!
        b0[b] = logSumExp(scratch, sc)
      }
      beta[0] = b0
      continue
    }
    const sa = size(i - 2)
    const triple = lattice.triple(i)
    const out = new Float64Array(sa * sb)
    for (let a = 0; a < sa; a++) {
      for (let b = 0; b < sb; b++) {
        for (let c = 0; c < sc; c++) {
          scratch[c] = -(pair[b * sc + c]! + (triple ? triple[(a * sb + b) * sc + c]! : 0)) / temperature + after[b * sc + c]!
        }
        out[a * sb + b] = logSumExp(scratch, sc)
      }
    }
    beta[i - 1] = out
  }
  return alpha.map((al, i) => {
    const sc = size(i)
    const be = beta[i]!
    const joint = new Float64Array(al.length)
    for (let j = 0; j < al.length; j++) joint[j] = al[j]! + be[j]!
    const z = logSumExp(joint, joint.length)
    const marginal = new Float64Array(sc)
    for (let j = 0; j < joint.length; j++) marginal[j % sc] = marginal[j % sc]! + (Number.isFinite(z) ? Math.exp(joint[j]! - z) : 0)
    return marginal
  })
}
