// The fingering cost model the searches read: the rules of ergonomics.ts, weighted and precomputed
// into small tables for single-note lines.
import { LEGATO_WEIGHTS, noteRules, pairRules, tripleRules, type Add, type RuleWeights } from './ergonomics'
import { spanTable, type SpanRow } from './spans'
import type { Finger, HandSize } from './types'

const KEY_RANGE = 257
const KEY_OFFSET = 128

export interface CostModel {
  readonly table: SpanRow[][]
  readonly weights: RuleWeights
  /** Cost of each finger on the first key of a line, index finger − 1. */
  first(k: number): Float64Array
  /** Cost of moving between two single notes, index (fa − 1) · 5 + (fb − 1); includes b's own rules. */
  pair(ka: number, kb: number): Float64Array
  /** Extra cost of three consecutive single notes, index ((fa − 1) · 5 + (fb − 1)) · 5 + (fc − 1). */
  triple(ka: number, kb: number, kc: number): Float64Array
}

const FINGER_LIST: readonly Finger[] = [1, 2, 3, 4, 5]
const pc = (k: number): number => ((k % 12) + 12) % 12
const clampInterval = (d: number): number => Math.max(-KEY_OFFSET, Math.min(KEY_OFFSET, d))

/** The weighted sum of the points that `run` hands to its callback. */
export function weigh(weights: RuleWeights, run: (add: Add) => void): number {
  let total = 0
  run((rule, points) => { total += weights[rule] * points })
  return total
}

/**
 * Builds the cost tables lazily: a pair's cost depends only on the first key's pitch class and the
 * interval (which fix both colours and the span), a triple's only on the two intervals, so a whole
 * line needs at most a few thousand small tables and the search itself only reads arrays.
 */
export function createCostModel(handSize: HandSize = 'medium', weights: RuleWeights = LEGATO_WEIGHTS): CostModel {
  const table = spanTable(handSize)
  const firsts: (Float64Array | undefined)[] = new Array(12)
  const pairs: (Float64Array | undefined)[] = new Array(12 * KEY_RANGE)
  const triples: (Float64Array | undefined)[] = new Array(KEY_RANGE * KEY_RANGE)
  return {
    table,
    weights,
    first(k) {
      const p = pc(k)
      let out = firsts[p]
      if (!out) {
        out = new Float64Array(5)
        for (const f of FINGER_LIST) out[f - 1] = weigh(weights, add => noteRules({ f, k: p }, add))
        firsts[p] = out
      }
      return out
    },
    pair(ka, kb) {
      const p = pc(ka)
      const d = clampInterval(kb - ka)
      const slot = p * KEY_RANGE + d + KEY_OFFSET
      let out = pairs[slot]
      if (!out) {
        out = new Float64Array(25)
        for (const fa of FINGER_LIST) {
          for (const fb of FINGER_LIST) {
            out[(fa - 1) * 5 + fb - 1] = weigh(weights, add => pairRules(table, { f: fa, k: p }, { f: fb, k: p + d }, add))
          }
        }
        pairs[slot] = out
      }
      return out
    },
    triple(ka, kb, kc) {
      const d1 = clampInterval(kb - ka)
      const d2 = clampInterval(kc - kb)
      const slot = (d1 + KEY_OFFSET) * KEY_RANGE + d2 + KEY_OFFSET
      let out = triples[slot]
      if (!out) {
        out = new Float64Array(125)
        for (const fa of FINGER_LIST) {
          for (const fb of FINGER_LIST) {
            for (const fc of FINGER_LIST) {
              out[((fa - 1) * 5 + fb - 1) * 5 + fc - 1] = weigh(weights, add =>
                tripleRules(table, { f: fa, k: 0 }, { f: fb, k: d1 }, { f: fc, k: d1 + d2 }, add))
            }
          }
        }
        triples[slot] = out
      }
      return out
    },
  }
}

const modelCache = new WeakMap<RuleWeights, Map<HandSize, CostModel>>()

/** One shared model per weighting and hand size; the tables only grow and are never invalidated. */
export function costModel(handSize: HandSize = 'medium', weights: RuleWeights = LEGATO_WEIGHTS): CostModel {
  let bySize = modelCache.get(weights)
  if (!bySize) {
    bySize = new Map()
    modelCache.set(weights, bySize)
  }
  let model = bySize.get(handSize)
  if (!model) {
    model = createCostModel(handSize, weights)
    bySize.set(handSize, model)
  }
  return model
}
