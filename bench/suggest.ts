// Suggestion speed on random-walk lines: notes per second for 1k, 10k and 100k notes (growth should be linear),
// and both hands' suggestion (a hand for every note) for 1k and 10k notes (goal: 10k under 100 ms).
import { fileURLToPath } from 'node:url'
import { suggestFingering, suggestHands } from '../shared/engine'

/** A reproducible random walk of steps up to a fifth, kept within the piano's range. */
function randomWalk(length: number, seed: number): number[] {
  let state = seed
  const next = (): number => {
    state = (state * 1664525 + 1013904223) >>> 0
    return state / 2 ** 32
  }
  const notes: number[] = []
  let key = 60
  for (let i = 0; i < length; i++) {
    key = Math.min(96, Math.max(36, key + Math.round((next() - 0.5) * 14)))
    notes.push(key)
  }
  return notes
}

export function benchSuggest(): void {
  // Warm the cost tables and the JIT so the figures show the steady state.
  suggestFingering({ hand: 'right', notes: randomWalk(20_000, 7) })
  for (const length of [1_000, 10_000, 100_000]) {
    const notes = randomWalk(length, length)
    // Best of three: the machine is shared, and the best run is the one least disturbed by others.
    let ms = Infinity
    for (let run = 0; run < 3; run++) {
      const start = performance.now()
      suggestFingering({ hand: 'right', notes })
      ms = Math.min(ms, performance.now() - start)
    }
    console.log(`suggest ${length.toLocaleString('en')} notes: ${ms.toFixed(1)} ms, ${Math.round(length / (ms / 1000)).toLocaleString('en')} notes/s`)
  }
  suggestHands({ notes: randomWalk(2_000, 11) })
  for (const length of [1_000, 10_000]) {
    // Wider steps than one hand's line, so that the hands have leaps to share.
    const notes = randomWalk(length, length + 1).map((m, i) => (i % 4 === 3 ? Math.min(96, m + 19) : m))
    let ms = Infinity
    for (let run = 0; run < 3; run++) {
      const start = performance.now()
      suggestHands({ notes })
      ms = Math.min(ms, performance.now() - start)
    }
    console.log(`suggest both hands ${length.toLocaleString('en')} notes: ${ms.toFixed(1)} ms, ${Math.round(length / (ms / 1000)).toLocaleString('en')} notes/s`)
  }
}

if (process.argv[1] === fileURLToPath(import.meta.url)) benchSuggest()
