// How long grading takes for long attempts: a seeded, slightly uneven performance of a
// two-octave C-major scale repeated, with a wrong, a missed and an extra note every 50.
import { gradeAttempt, inferFingering, nameFromMidi, pairNoteEvents, type DrillMusic, type DrillNote, type Finger, type PlayedEvent } from '../shared/engine'
import { medianMs, medianTimes } from './timing'

// Right-hand C major over two octaves, up and down (standard fingering, common practice).
const UP = [60, 62, 64, 65, 67, 69, 71, 72, 74, 76, 77, 79, 81, 83, 84]
const UP_FINGERS: Finger[] = [1, 2, 3, 1, 2, 3, 4, 1, 2, 3, 1, 2, 3, 4, 5]
const CYCLE = [...UP, ...UP.slice(1, -1).reverse()]
const CYCLE_FINGERS = [...UP_FINGERS, ...[4, 3, 2, 1, 3, 2, 1, 4, 3, 2, 1, 3, 2] as Finger[]]

/** A small linear congruential generator, so every run measures the same attempt. */
function random(seed: number): () => number {
  let state = seed >>> 0
  return () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0
    return state / 2 ** 32
  }
}

export function benchAttempt(count: number): { drill: DrillMusic, events: PlayedEvent[] } {
  const notes: DrillNote[] = Array.from({ length: count }, (_, k) => ({
    pitch: nameFromMidi(CYCLE[k % CYCLE.length]!),
    beat: k / 2,
    length: 0.5,
    finger: CYCLE_FINGERS[k % CYCLE.length]!,
  }))
  const next = random(count)
  const events: PlayedEvent[] = []
  const msPerBeat = 600
  notes.forEach((n, k) => {
    if (k % 50 === 17) return // missed
    const midi = CYCLE[k % CYCLE.length]! + (k % 50 === 33 ? 1 : 0) // wrong
    const on = n.beat * msPerBeat + (next() - 0.5) * 30
    events.push({ note: midi, on: true, velocity: 60 + Math.floor(next() * 20), timeMs: on })
    events.push({ note: midi, on: false, timeMs: on + 280 })
    if (k % 50 === 41) events.push({ note: 90, on: true, velocity: 40, timeMs: on + 100 }, { note: 90, on: false, timeMs: on + 150 })
  })
  return { drill: { hand: 'right', tempoBpm: 100, notes }, events }
}

export function benchGrade(): void {
  // The server grades attempt after attempt in one process, so the goal is the warm figure; the very
  // first grade, which also pays for compiling the engine, is printed beside it.
  console.log('grading (median of runs once warm, wall clock and this process\'s CPU time; "first" is the process\'s first grade of that size; "inference" is inferFingering alone on the same notes)')
  for (const [count, warmUps, repeats] of [[1_000, 40, 21], [10_000, 4, 5], [100_000, 1, 3]] as const) {
    const { drill, events } = benchAttempt(count)
    const performed = pairNoteEvents(events).map(n => ({ midi: n.midi, onMs: n.onMs, offMs: n.offMs, velocity: n.velocity ?? 64 }))
    const firstMs = medianMs(() => gradeAttempt(drill, events), 1)
    for (let w = 0; w < warmUps; w++) gradeAttempt(drill, events)
    const { wallMs: ms, cpuMs } = medianTimes(() => gradeAttempt(drill, events), repeats)
    const inferMs = medianMs(() => inferFingering('right', performed), repeats)
    console.log(`  ${String(count).padStart(7)} notes: ${ms.toFixed(2).padStart(9)} ms (CPU ${cpuMs.toFixed(2)} ms)  ${Math.round(count / (ms / 1000)).toLocaleString('en-GB').padStart(12)} notes/s  (first ${firstMs.toFixed(1)} ms; inference ${inferMs.toFixed(2)} ms)`)
  }
}
