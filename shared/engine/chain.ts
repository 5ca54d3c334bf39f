// Second-order chain search shared by suggestion (cheapest path) and inference (most probable path, posteriors).
// A state is the pair (option at the previous item, option at this item), so rules over three
// consecutive notes apply exactly while the work stays linear in the length of the line.

/**
 * Costs of a line of items, each with a few options (fingers, or finger assignments for chords). A
 * table handed out may be refilled by the next call of the same method, so readers finish with one
 * before they ask for the next.
 */
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

/**
 * The cheapest path (Viterbi over state pairs). The passes are functions of their own, each one loop,
 * so that the engine optimises each whole rather than re-entering one long function mid-loop.
 */
export function cheapestPath(lattice: Lattice): ChainPath {
  const n = lattice.sizes.length
  if (n === 0) return { path: [], cost: 0 }
  if (n === 1) {
    const first = lattice.first()
    const best = argmin(first, lattice.sizes[0]!)
    return { path: [best], cost: first[best]! }
  }
  const layout = stateLayout(lattice)
  // The best option at item i − 2 for each state (b, c) of item i, in the states' layout.
  const back = new Int8Array(layout.offsets[n]!)
  const last = viterbi(lattice, layout, back)
  return tracePath(layout, back, last)
}

/** Fills `back` and returns the cheapest cost into each state of the last item. */
function viterbi(lattice: Lattice, layout: StateLayout, back: Int8Array): Float64Array {
  const { sizes, offsets, maxSize } = layout
  const first = lattice.first()
  let prev = new Float64Array(maxSize * maxSize)
  let next = new Float64Array(maxSize * maxSize)
  const s0 = sizes[0]!
  const s1 = sizes[1]!
  const pair1 = lattice.pair(1)
  for (let b = 0; b < s0; b++) {
    for (let c = 0; c < s1; c++) prev[b * s1 + c] = first[b]! + pair1[b * s1 + c]!
  }
  // Items without a triple term read zeros, so that the innermost loop has no branch on it.
  let zeros: Float64Array | null = null
  for (let i = 2; i < sizes.length; i++) {
    const sa = sizes[i - 2]!
    const sb = sizes[i - 1]!
    const sc = sizes[i]!
    const pair = lattice.pair(i)
    const triple = lattice.triple(i) ?? (zeros ??= new Float64Array(maxSize * maxSize * maxSize))
    const offset = offsets[i]!
    // The indices step through the a loop instead of being multiplied out at every step (a few per cent of the search).
    const stride = sb * sc
    for (let b = 0; b < sb; b++) {
      for (let c = 0; c < sc; c++) {
        let best = Infinity
        let bestA = 0
        for (let a = 0, from = b, t = b * sc + c; a < sa; a++, from += sb, t += stride) {
          const v = prev[from]! + triple[t]!
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
  return prev
}

/**
 * The path back from the cheapest state of the last item. The result is made before the loop, so that
 * code the engine compiles while in the loop has seen everything that runs after it.
 */
function tracePath(layout: StateLayout, back: Int8Array, last: Float64Array): ChainPath {
  const { sizes, offsets } = layout
  const n = sizes.length
  const sc = sizes[n - 1]!
  const end = argmin(last, sizes[n - 2]! * sc)
  const result: ChainPath = { path: new Array<number>(n), cost: last[end]! }
  const { path } = result
  path[n - 1] = end % sc
  path[n - 2] = Math.floor(end / sc)
  for (let i = n - 1; i >= 2; i--) path[i - 2] = back[offsets[i]! + path[i - 1]! * sizes[i]! + path[i]!]!
  return result
}

/** The cost `path` adds at item i: its first option's cost, or its move from the items before. */
function stepCost(lattice: Lattice, path: number[], i: number): number {
  const c = path[i]!
  if (i === 0) return lattice.first()[c]!
  const sc = lattice.sizes[i]!
  const b = path[i - 1]!
  const triple = i >= 2 ? lattice.triple(i) : null
  return lattice.pair(i)[b * sc + c]! + (triple ? triple[(path[i - 2]! * lattice.sizes[i - 1]! + b) * sc + c]! : 0)
}

/** The total cost of one path through the lattice. */
export function pathCost(lattice: Lattice, path: number[]): number {
  let total = 0
  for (let i = 0; i < path.length; i++) total += stepCost(lattice, path, i)
  return total
}

/** The dearest single step of `path`: a whole path's cost grows with its length, a step's does not. */
export function dearestStep(lattice: Lattice, path: number[]): number {
  let worst = 0
  for (let i = 0; i < path.length; i++) worst = Math.max(worst, stepCost(lattice, path, i))
  return worst
}

/** log Σ exp(values[from + k · stride]) over k < count, shifted by the largest term so that nothing overflows. */
function logSumExp(values: Float64Array, from: number, count: number, stride: number): number {
  let max = -Infinity
  for (let k = 0, j = from; k < count; k++, j += stride) if (values[j]! > max) max = values[j]!
  if (!Number.isFinite(max)) return max
  let sum = 0
  for (let k = 0, j = from; k < count; k++, j += stride) sum += Math.exp(values[j]! - max)
  return max + Math.log(sum)
}

interface TripleWeights { temperature: number, shift: number, span: number, weights: Float64Array }

const NO_TRIPLE: { shift: number, weights: Float64Array | null } = { shift: 0, weights: null }

const tripleWeightCache = new WeakMap<ArrayLike<number>, TripleWeights>()

/**
 * A triple table as linear weights exp(−(cost − least) / temperature), with least / temperature as
 * `shift` and the table's range in temperatures as `span`. Kept per table, because a line's lattice
 * hands out the same few model tables again and again, so their exponentials are taken once rather
 * than at every note. Measured from the least cost, every weight stays representable unless a table
 * spans more than about 1,400 temperatures.
 */
function tripleWeights(triple: ArrayLike<number>, temperature: number): TripleWeights {
  const cached = tripleWeightCache.get(triple)
  if (cached && cached.temperature === temperature) return cached
  let least = Infinity
  let most = -Infinity
  for (let j = 0; j < triple.length; j++) {
    least = Math.min(least, triple[j]!)
    most = Math.max(most, triple[j]!)
  }
  const weights = new Float64Array(triple.length)
  for (let j = 0; j < triple.length; j++) weights[j] = Math.exp(-(triple[j]! - least) / temperature)
  const made = { temperature, shift: least / temperature, span: (most - least) / temperature, weights }
  tripleWeightCache.set(triple, made)
  return made
}

/**
 * The most temperatures a table (first, pair or triple) may span for the linear pass. Every factor
 * is then at least e^−150, and two states of one item differ by at most four factors in either pass
 * (their own table and the item before's, pair and triple), so after each item is rescaled to a
 * largest state of 1, every state is at least e^−600: full double precision (which ends at e^−708),
 * and a joint weight alpha · beta lost to underflow is below e^−600 of its item's total.
 */
const LINEAR_SPAN = 150

/** All items' states in one flat array: item i ≥ 1 at offsets[i], its state (b, c) at b · sizes[i] + c (item 0 at 0). */
interface StateLayout { sizes: Int32Array, offsets: Int32Array, maxSize: number }

function stateLayout(lattice: Lattice): StateLayout {
  const n = lattice.sizes.length
  const sizes = new Int32Array(n)
  const offsets = new Int32Array(n + 1)
  let maxSize = 1
  for (let i = 0; i < n; i++) {
    sizes[i] = lattice.sizes[i]!
    offsets[i + 1] = i === 0 ? sizes[0]! : offsets[i]! + sizes[i - 1]! * sizes[i]!
    maxSize = Math.max(maxSize, sizes[i]!)
  }
  return { sizes, offsets, maxSize }
}

/**
 * Writes exp(−(cost − least) / temperature) of `count` costs at `at`, or returns false (writing
 * nothing) when the costs are not all finite or span more than LINEAR_SPAN temperatures.
 */
function linearWeights(costs: ArrayLike<number>, count: number, temperature: number, out: Float64Array, at: number): boolean {
  let least = Infinity
  let most = -Infinity
  for (let j = 0; j < count; j++) {
    least = Math.min(least, costs[j]!)
    most = Math.max(most, costs[j]!)
  }
  if (!((most - least) / temperature <= LINEAR_SPAN)) return false
  for (let j = 0; j < count; j++) out[at + j] = Math.exp(-(costs[j]! - least) / temperature)
  return true
}

/** Divides `count` values at `from` by `by`, which the caller knows is positive. */
function rescale(values: Float64Array, from: number, count: number, by: number): void {
  const inverse = 1 / by
  for (let j = from; j < from + count; j++) values[j] = values[j]! * inverse
}

/**
 * Every item's option probabilities in one array, option o of item i at values[start[i] + o]: an
 * array per item would be an object per note for the garbage collector to copy.
 */
export interface OptionPosteriors { start: Int32Array, values: Float64Array }

function posteriorsFor(sizes: Int32Array): OptionPosteriors {
  const start = new Int32Array(sizes.length + 1)
  for (let i = 0; i < sizes.length; i++) start[i + 1] = start[i]! + sizes[i]!
  return { start, values: new Float64Array(start[sizes.length]!) }
}

/**
 * Posterior probability of every option of every item when a path's probability is proportional to
 * exp(−cost / temperature): forward–backward over the same state pairs. In linear space with every
 * item rescaled (one exponential per pair entry, none per state) whenever every table spans at most
 * LINEAR_SPAN temperatures, as any ergonomic model's do; otherwise in log space, which holds for any costs.
 */
export function optionPosteriors(lattice: Lattice, temperature: number): OptionPosteriors {
  if (lattice.sizes.length === 0) return posteriorsFor(new Int32Array(0))
  const layout = stateLayout(lattice)
  return linearPosteriors(lattice, temperature, layout) ?? logPosteriors(lattice, temperature, layout)
}

/**
 * Scaled forward–backward, or null when a table spans too much for it. Each item's alpha and beta are
 * divided by their largest state, which leaves every posterior unchanged, since each item's joint
 * weights are normalised to sum 1.
 */
function linearPosteriors(lattice: Lattice, temperature: number, layout: StateLayout): OptionPosteriors | null {
  const weights = linearTables(lattice, temperature, layout)
  if (!weights) return null
  return backwardMarginals(weights, forward(weights, layout), layout)
}

/**
 * Work arrays of a state per note (each state's own weight and alpha in the linear passes, the
 * inference's pair costs), kept from one call to the next: at 25 doubles a note they are 20 MB each
 * for a 100,000-note attempt, and fresh ones every call cost the garbage collector more than the
 * passes that fill them. Each slot has one user at a time, and every entry a user reads it has
 * written first in the same call, so what an earlier call left there never shows. They grow to the
 * longest line seen and stay (our choice: 60 MB after a 100,000-note attempt).
 */
const workArrays: Float64Array[] = []

/** Slots of workArray, one per user. */
export const WORK_OWN = 0
export const WORK_ALPHA = 1
export const WORK_PAIRS = 2

export function workArray(slot: number, length: number): Float64Array {
  let buffer = workArrays[slot]
  if (!buffer || buffer.length < length) {
    buffer = new Float64Array(length)
    workArrays[slot] = buffer
  }
  return buffer.length === length ? buffer : buffer.subarray(0, length)
}

/** Each state's own weight and each item's triple weights, for the linear passes. */
interface LinearTables {
  /** The first table's weights at item 0, the pair table's after it, in the states' layout. */
  own: Float64Array
  triples: (Float64Array | null)[]
}

function linearTables(lattice: Lattice, temperature: number, layout: StateLayout): LinearTables | null {
  const { sizes, offsets } = layout
  const n = sizes.length
  const own = workArray(WORK_OWN, offsets[n]!)
  if (!linearWeights(lattice.first(), sizes[0]!, temperature, own, 0)) return null
  const triples: (Float64Array | null)[] = new Array(n).fill(null)
  for (let i = 1; i < n; i++) {
    if (!linearWeights(lattice.pair(i), sizes[i - 1]! * sizes[i]!, temperature, own, offsets[i]!)) return null
    const triple = i >= 2 ? lattice.triple(i) : null
    if (!triple) continue
    const { span, weights } = tripleWeights(triple, temperature)
    if (!(span <= LINEAR_SPAN)) return null
    triples[i] = weights
  }
  return { own, triples }
}

/** Alpha of every state, each item rescaled to a largest state of 1. */
function forward({ own, triples }: LinearTables, layout: StateLayout): Float64Array {
  const { sizes, offsets } = layout
  const n = sizes.length
  const alpha = workArray(WORK_ALPHA, offsets[n]!)
  alpha.set(own.subarray(0, sizes[0]!))
  for (let i = 1; i < n; i++) {
    const sb = sizes[i - 1]!
    const sc = sizes[i]!
    const here = offsets[i]!
    const sa = i >= 2 ? sizes[i - 2]! : 1
    const before = i >= 2 ? offsets[i - 1]! : 0
    const weights = triples[i] ?? null
    const stride = sb * sc
    let largest = 0
    for (let b = 0; b < sb; b++) {
      for (let c = 0; c < sc; c++) {
        let sum = 0
        if (weights) for (let a = 0, from = before + b, w = b * sc + c; a < sa; a++, from += sb, w += stride) sum += alpha[from]! * weights[w]!
        else for (let a = 0, from = before + b; a < sa; a++, from += sb) sum += alpha[from]!
        const value = sum * own[here + b * sc + c]!
        alpha[here + b * sc + c] = value
        largest = Math.max(largest, value)
      }
    }
    rescale(alpha, here, sb * sc, largest)
  }
  return alpha
}

/**
 * The backward pass, taking each item's marginals as soon as its beta is complete; beta is kept only
 * for the item at hand and the one before it, in two buffers that swap.
 */
function backwardMarginals({ own, triples }: LinearTables, alpha: Float64Array, layout: StateLayout): OptionPosteriors {
  const { sizes, offsets } = layout
  const n = sizes.length
  const stateCount = layout.maxSize * layout.maxSize
  let beta = new Float64Array(stateCount).fill(1)
  let betaBefore = new Float64Array(stateCount)
  const marginals = posteriorsFor(sizes)
  // What follows item i − 1 in state b through each option c of item i, whatever came before b.
  const after = new Float64Array(layout.maxSize)
  for (let i = n - 1; i >= 0; i--) {
    marginal(alpha, offsets[i]!, offsets[i + 1]! - offsets[i]!, sizes[i]!, beta, marginals.values, marginals.start[i]!)
    if (i === 0) break
    const sb = sizes[i - 1]!
    const sc = sizes[i]!
    const here = offsets[i]!
    const sa = i >= 2 ? sizes[i - 2]! : 1
    const weights = triples[i] ?? null
    let largest = 0
    for (let b = 0; b < sb; b++) {
      let whole = 0
      for (let c = 0; c < sc; c++) {
        after[c] = own[here + b * sc + c]! * beta[b * sc + c]!
        whole += after[c]!
      }
      for (let a = 0; a < sa; a++) {
        // Without a triple term what follows does not depend on the option at item i − 2.
        let sum = whole
        if (weights) {
          sum = 0
          for (let c = 0; c < sc; c++) sum += after[c]! * weights[(a * sb + b) * sc + c]!
        }
        betaBefore[a * sb + b] = sum
        largest = Math.max(largest, sum)
      }
    }
    rescale(betaBefore, 0, sa * sb, largest)
    const swap = beta
    beta = betaBefore
    betaBefore = swap
  }
  return marginals
}

/** Writes the posterior of each of an item's sc options, from its `count` states' alpha (at `from`) and beta (at 0), to `out` at `at` (zeros before). */
function marginal(alpha: Float64Array, from: number, count: number, sc: number, beta: Float64Array, out: Float64Array, at: number): void {
  let z = 0
  for (let j = 0; j < count; j += sc) {
    for (let c = 0; c < sc; c++) {
      const joint = alpha[from + j + c]! * beta[j + c]!
      out[at + c] = out[at + c]! + joint
      z += joint
    }
  }
  rescale(out, at, sc, z)
}

/**
 * Forward–backward in log space, so that no costs, however far apart, underflow or overflow. A sum
 * that takes a triple term is done in linear space relative to its largest state, with the triple's
 * cached weights: one exponential per state instead of one per state and option, and since the
 * largest state's term is a weight measured from the table's least cost, the sum cannot vanish.
 */
function logPosteriors(lattice: Lattice, temperature: number, layout: StateLayout): OptionPosteriors {
  const { sizes, offsets, maxSize } = layout
  const n = sizes.length
  const alpha = new Float64Array(offsets[n]!)
  // Both passes read every pair table, so each is fetched from the lattice once, into the states' layout.
  const pairs = new Float64Array(offsets[n]!)
  const first = lattice.first()
  for (let c = 0; c < sizes[0]!; c++) alpha[c] = -first[c]! / temperature
  const scratch = new Float64Array(maxSize)
  for (let i = 1; i < n; i++) {
    const sb = sizes[i - 1]!
    const sc = sizes[i]!
    const here = offsets[i]!
    pairs.set(lattice.pair(i), here)
    const sa = i >= 2 ? sizes[i - 2]! : 1
    const before = i >= 2 ? offsets[i - 1]! : 0
    const triple = i >= 2 ? lattice.triple(i) : null
    const { shift, weights } = triple ? tripleWeights(triple, temperature) : NO_TRIPLE
    for (let b = 0; b < sb; b++) {
      let max = -Infinity
      for (let a = 0; a < sa; a++) max = Math.max(max, alpha[before + a * sb + b]!)
      if (!weights || !Number.isFinite(max)) {
        const into = logSumExp(alpha, before + b, sa, sb)
        for (let c = 0; c < sc; c++) alpha[here + b * sc + c] = into - pairs[here + b * sc + c]! / temperature
        continue
      }
      for (let a = 0; a < sa; a++) scratch[a] = Math.exp(alpha[before + a * sb + b]! - max)
      for (let c = 0; c < sc; c++) {
        let sum = 0
        for (let a = 0; a < sa; a++) sum += scratch[a]! * weights[(a * sb + b) * sc + c]!
        alpha[here + b * sc + c] = max - shift + Math.log(sum) - pairs[here + b * sc + c]! / temperature
      }
    }
  }
  // beta has the shape of alpha: the log weight of everything after item i given its state.
  const beta = new Float64Array(offsets[n]!)
  for (let i = n - 1; i >= 1; i--) {
    const sb = sizes[i - 1]!
    const sc = sizes[i]!
    const here = offsets[i]!
    const sa = i >= 2 ? sizes[i - 2]! : 1
    const out = i >= 2 ? offsets[i - 1]! : 0
    const triple = i >= 2 ? lattice.triple(i) : null
    const { shift, weights } = triple ? tripleWeights(triple, temperature) : NO_TRIPLE
    for (let b = 0; b < sb; b++) {
      let max = -Infinity
      for (let c = 0; c < sc; c++) {
        scratch[c] = -pairs[here + b * sc + c]! / temperature + beta[here + b * sc + c]!
        max = Math.max(max, scratch[c]!)
      }
      if (!weights || !Number.isFinite(max)) {
        // Without a triple term the weight after item i does not depend on the option at item i − 2.
        const whole = logSumExp(scratch, 0, sc, 1)
        for (let a = 0; a < sa; a++) beta[out + a * sb + b] = whole
        continue
      }
      for (let c = 0; c < sc; c++) scratch[c] = Math.exp(scratch[c]! - max)
      for (let a = 0; a < sa; a++) {
        let sum = 0
        for (let c = 0; c < sc; c++) sum += scratch[c]! * weights[(a * sb + b) * sc + c]!
        beta[out + a * sb + b] = max - shift + Math.log(sum)
      }
    }
  }
  const joint = new Float64Array(maxSize * maxSize)
  const marginals = posteriorsFor(sizes)
  const { values } = marginals
  for (let i = 0; i < n; i++) {
    const sc = sizes[i]!
    const from = offsets[i]!
    const length = offsets[i + 1]! - from
    const at = marginals.start[i]!
    for (let j = 0; j < length; j++) joint[j] = alpha[from + j]! + beta[from + j]!
    const z = logSumExp(joint, 0, length, 1)
    if (Number.isFinite(z)) for (let j = 0; j < length; j++) values[at + j % sc] = values[at + j % sc]! + Math.exp(joint[j]! - z)
  }
  return marginals
}
