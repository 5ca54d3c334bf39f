// Suggestion speed on random-walk lines: notes per second for 1k, 10k and 100k notes (growth should be linear),
// and both hands' suggestion (a hand for every note) for 1k and 10k notes (goal: 10k under 100 ms). Median of
// five runs, wall clock and this process's CPU time (bench/timing.ts).
import { fileURLToPath } from 'node:url'
import { suggestFingering, suggestHands } from '../shared/engine'
import { medianTimes } from './timing'

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
    const { wallMs: ms, cpuMs } = medianTimes(() => suggestFingering({ hand: 'right', notes }), 5)
    console.log(`suggest ${length.toLocaleString('en')} notes: ${ms.toFixed(1)} ms (CPU ${cpuMs.toFixed(1)} ms), ${Math.round(length / (ms / 1000)).toLocaleString('en')} notes/s (by CPU ${Math.round(length / (cpuMs / 1000)).toLocaleString('en')})`)
  }
  suggestHands({ notes: randomWalk(2_000, 11) })
  for (const length of [1_000, 10_000]) {
    // Wider steps than one hand's line, so that the hands have leaps to share.
    const notes = randomWalk(length, length + 1).map((m, i) => (i % 4 === 3 ? Math.min(96, m + 19) : m))
    const { wallMs: ms, cpuMs } = medianTimes(() => suggestHands({ notes }), 5)
    console.log(`suggest both hands ${length.toLocaleString('en')} notes: ${ms.toFixed(1)} ms (CPU ${cpuMs.toFixed(1)} ms), ${Math.round(length / (ms / 1000)).toLocaleString('en')} notes/s`)
  }
}

if (process.argv[1] === fileURLToPath(import.meta.url)) benchSuggest()
