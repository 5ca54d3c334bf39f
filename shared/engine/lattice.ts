// The ergonomic cost of a line as a chain lattice: options are finger choices (chord assignments for chords).
import type { Lattice } from './chain'
import { weigh, type CostModel } from './costs'
import { chordRules, chordTransitionRules } from './ergonomics'
import { chordOptions, type Touch } from './touches'
import type { Finger } from './types'

export interface LineLattice extends Lattice {
  /** Keys of each item in right-hand space, ascending. */
  keys: number[][]
  /** The finger assignments of each item (ascending with the keys). */
  options: Finger[][][]
}

function touchesOf(keys: number[], fingers: Finger[]): Touch[] {
  return keys.map((k, j) => ({ f: fingers[j]!, k }))
}

/**
 * Single notes read the model's precomputed tables; anything involving a chord is computed on the spot
 * (chord lines are short and their option counts small).
 */
export function lineLattice(keys: number[][], model: CostModel): LineLattice {
  const options = keys.map(k => chordOptions(k.length))
  const sizes = options.map(o => o.length)
  const single = (i: number): boolean => keys[i]!.length === 1
  const { table, weights } = model
  return {
    keys,
    options,
    sizes,
    first() {
      if (single(0)) return model.first(keys[0]![0]!)
      return options[0]!.map(fingers => weigh(weights, add => chordRules(table, touchesOf(keys[0]!, fingers), add)))
    },
    pair(i) {
      if (single(i - 1) && single(i)) return model.pair(keys[i - 1]![0]!, keys[i]![0]!)
      const out = new Float64Array(sizes[i - 1]! * sizes[i]!)
      options[i - 1]!.forEach((fromFingers, b) => {
        const from = touchesOf(keys[i - 1]!, fromFingers)
        options[i]!.forEach((toFingers, c) => {
          const to = touchesOf(keys[i]!, toFingers)
          out[b * sizes[i]! + c] = weigh(weights, (add) => {
            chordRules(table, to, add)
            chordTransitionRules(table, from, to, add)
          })
        })
      })
      return out
    },
    triple(i) {
      if (!single(i - 2) || !single(i - 1) || !single(i)) return null
      return model.triple(keys[i - 2]![0]!, keys[i - 1]![0]!, keys[i]![0]!)
    },
  }
}

/** The chosen fingers of each item, as touches (keys in right-hand space). */
export function chosenTouches(lattice: LineLattice, path: number[]): Touch[][] {
  return path.map((o, i) => touchesOf(lattice.keys[i]!, lattice.options[i]![o]!))
}

/** The same lattice with a cost added to each option of each item (an option of a single note is its finger − 1). */
export function withOptionPenalty(lattice: Lattice, penalty: (i: number, option: number) => number): Lattice {
  const penalise = (costs: ArrayLike<number>, i: number): Float64Array => {
    const out = new Float64Array(costs)
    const size = lattice.sizes[i]!
    for (let j = 0; j < out.length; j++) out[j] = out[j]! + penalty(i, j % size)
    return out
  }
  return {
    sizes: lattice.sizes,
    first: () => penalise(lattice.first(), 0),
    pair: i => penalise(lattice.pair(i), i),
    triple: i => lattice.triple(i),
  }
}
