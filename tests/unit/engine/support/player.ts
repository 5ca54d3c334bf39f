// A simulated pianist: performances of drills played with a known fingering, to measure how well the
// inference recovers that fingering from the timing alone. The player model is our own (no published
// figures); every number below is marked as our choice.
//
// The model. A figure is a line of notes with the fingering the player really uses and, for every move
// between two notes, what that move asks of the hand:
// - `inPosition`: the next finger is already over its key; the player keeps their own articulation.
// - `crossing`: the thumb passes under a finger, or a finger over the thumb; legato is kept, the onset
//   comes a little late (0–6 % of the step) and a legato player's overlap shrinks.
// - `sameFinger`: one finger plays two neighbouring keys; it has to leave the first key, so a legato
//   player leaves a silence of 12–25 % of the step, a little late (0–8 %); a détaché player's own
//   silence is already enough, so nothing changes.
// - `lift`: the hand leaves the keys for a new position (it ran out of fingers, or jumps); a silence
//   of 30–50 % of the step beyond the player's own articulation and an onset 13–20 % of the step late
//   (at 100 bpm in eighths, 90–150 ms and 40–60 ms). The delay is not caught up.
// The player's own articulation is legato (each key released 10–40 ms after the next is pressed, at
// most 15 % of the step) or détaché (released after 55–70 % of the step). Every onset wanders with a
// jitter of 2.5 % of the step (at least 4 ms, Gaussian), every release with 3 %, and the tempo drifts
// by up to ±5 % over the performance. Velocities are 64 ± 6, unrelated to the finger.
// The left hand plays the mirror image of each figure (the keyboard is symmetric about D, so the
// motion and the key colours are the same), two octaves lower.
import type { Finger, Hand } from '../../../../shared/engine/types'
import type { PerformedNote } from '../../../../shared/engine/infer'
import { gaussian, seededRandom } from '../../../../shared/utils/random'

export type Move = 'inPosition' | 'crossing' | 'sameFinger' | 'lift'
export type Category = 'scale' | 'fiveFinger' | 'sequence' | 'passage'
export type Articulation = 'legato' | 'detache'

/** A figure in right-hand space: pitches, the fingering really used, beats, and the moves where the hand lifts. */
export interface Figure {
  name: string
  category: Category
  midi: number[]
  fingers: Finger[]
  /** Length of each note in beats (default: all eighths, half a beat). */
  beats?: number[]
  /** Indices of notes the hand lifts to (a new position reached through the air). */
  lifts?: number[]
  /**
   * False where the timing cannot tell the fingers, only where the hand moved: a group of three or
   * four notes after a lift fits 1 2 3 as well as 2 3 4 (the player's choice, not the timing's).
   */
  fingersTold?: boolean
}

export interface Performance {
  figure: Figure
  hand: Hand
  bpm: number
  articulation: Articulation
  notes: PerformedNote[]
  fingers: Finger[]
  /** Where a new hand position begins: every crossing, same-finger move and lift. */
  positions: number[]
  /** Whether the timing alone tells every position change: false where a détaché player moves one finger a step (no silence beyond their own). */
  decisive: boolean
  moves: Move[]
}

const uniform = (random: () => number, low: number, high: number): number => low + (high - low) * random()

/** The move into note i, judged from the fingering the player uses (right-hand space). */
export function moveInto(figure: Figure, i: number): Move {
  if (figure.lifts?.includes(i)) return 'lift'
  const a = figure.fingers[i - 1]!
  const b = figure.fingers[i]!
  const up = figure.midi[i]! - figure.midi[i - 1]!
  if (a === b && up !== 0) return 'sameFinger'
  // The thumb below a finger it follows or precedes in the wrong direction: a pass under or over.
  if ((b === 1 && a !== 1 && up > 0) || (a === 1 && b !== 1 && up < 0)) return 'crossing'
  return 'inPosition'
}

export interface PlayOptions {
  hand: Hand
  bpm: number
  articulation: Articulation
  seed: number
}

/** One performance of a figure by the model player. */
export function perform(figure: Figure, options: PlayOptions): Performance {
  const random = seededRandom(options.seed)
  const n = figure.midi.length
  const lengths = figure.beats ?? figure.midi.map(() => 0.5)
  const msPerBeat = 60000 / options.bpm
  const drift = uniform(random, -0.05, 0.05)
  const moves: Move[] = ['inPosition']
  for (let i = 1; i < n; i++) moves.push(moveInto(figure, i))
  const onsets: number[] = []
  const steps: number[] = []
  const beats: number[] = []
  // Where the note would fall with the tempo's drift and every delay so far, before its own jitter.
  let clock = 0
  for (let i = 0; i < n; i++) {
    const step = lengths[i]! * msPerBeat * (1 + drift * (i / Math.max(1, n - 1)))
    steps.push(step)
    const before = i > 0 ? steps[i - 1]! : step
    if (moves[i] === 'lift') clock += uniform(random, 0.13, 0.2) * before
    if (moves[i] === 'crossing') clock += uniform(random, 0, 0.06) * before
    if (moves[i] === 'sameFinger' && options.articulation === 'legato') clock += uniform(random, 0, 0.08) * before
    onsets.push(clock + Math.max(4, 0.025 * before) * gaussian(random))
    beats.push(i === 0 ? 0 : beats[i - 1]! + lengths[i - 1]!)
    clock += step
  }
  const notes: PerformedNote[] = []
  for (let i = 0; i < n; i++) {
    const step = steps[i]!
    const next = i + 1 < n ? onsets[i + 1]! : onsets[i]! + step
    const move = i + 1 < n ? moves[i + 1]! : 'inPosition'
    let off = options.articulation === 'legato'
      ? next + Math.min(uniform(random, 10, 40), 0.15 * step)
      : onsets[i]! + uniform(random, 0.55, 0.7) * (next - onsets[i]!)
    if (move === 'crossing' && options.articulation === 'legato') off = next + Math.min(uniform(random, 0, 20), 0.08 * step)
    if (move === 'sameFinger' && options.articulation === 'legato') off = next - uniform(random, 0.12, 0.25) * step
    if (move === 'lift') off = Math.min(off, next) - uniform(random, 0.3, 0.5) * step
    off += 0.03 * step * gaussian(random)
    // A key is released after it is pressed, whatever the jitter says.
    off = Math.max(off, onsets[i]! + 0.1 * step)
    notes.push({ midi: figure.midi[i]!, onMs: onsets[i]!, offMs: off, velocity: Math.round(64 + 6 * gaussian(random)), beat: beats[i]! })
  }
  const positions: number[] = []
  for (let i = 1; i < n; i++) if (moves[i] !== 'inPosition') positions.push(i)
  const played = options.hand === 'left' ? notes.map(note => ({ ...note, midi: 124 - note.midi - 24 })) : notes
  return {
    figure,
    hand: options.hand,
    bpm: options.bpm,
    articulation: options.articulation,
    notes: played,
    fingers: figure.fingers,
    positions,
    decisive: !(options.articulation === 'detache' && moves.includes('sameFinger')),
    moves,
  }
}
