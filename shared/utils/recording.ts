// A drill played in rather than typed: the keys pressed while recording become notes, the teacher
// trims stray notes at the start and end, and the onsets and releases are snapped to a grid at the
// tempo the drill was played at, so the editor receives written beats and lengths.
import { midiFromName, nameFromMidi, pairNoteEvents, spellingForKey, type DrillNote, type Spelling } from '../engine'

/** A recorded key press, on the performance.now() clock (ms). */
export interface RecordedNote {
  midi: number
  onMs: number
  offMs: number
}

/** A key going down or up while recording (the shape the inputs report, `LiveNoteEvent`). */
export interface RecordedKey {
  note: number
  on: boolean
  timeStampMs: number
}

/**
 * The grids a recording can be snapped to, in steps per beat (a beat is a quarter note, as in the
 * drill notation): eighths halve the beat, triplet eighths divide it in three, sixteenths in four
 * (common practice).
 */
export const QUANTISE_GRIDS = {
  eighth: { stepsPerBeat: 2, label: 'Eighths' },
  triplet: { stepsPerBeat: 3, label: 'Eighth triplets' },
  sixteenth: { stepsPerBeat: 4, label: 'Sixteenths' },
} as const
export type QuantiseGrid = keyof typeof QUANTISE_GRIDS

/** The longest note a drill holds (DrillNote's `length`). */
const MAX_LENGTH_BEATS = 64

/**
 * Pairs presses with releases in time order (the engine's pairing: a repeat is two notes, a release
 * without a press is dropped). A key still down when recording stopped is held to `endMs`.
 */
export function recordedNotes(keys: readonly RecordedKey[], endMs: number): RecordedNote[] {
  const paired = pairNoteEvents(keys.map(k => ({ note: k.note, on: k.on, timeMs: k.timeStampMs })))
  return paired
    .map(n => ({ midi: n.midi, onMs: n.onMs, offMs: Math.max(n.onMs, n.offMs ?? endMs) }))
    .sort((a, b) => a.onMs - b.onMs || a.midi - b.midi)
}

/**
 * Keeps the notes from the `first` to the `last` (both counted from 1, as the editor shows them, and
 * both kept), in onset order; bounds outside the recording are brought inside it.
 */
export function trimRecording(notes: readonly RecordedNote[], first: number, last: number): RecordedNote[] {
  const from = Math.max(1, Math.floor(first))
  const to = Math.min(notes.length, Math.floor(last))
  return notes.slice(from - 1, Math.max(from - 1, to))
}

export interface QuantiseOptions {
  /** The tempo the recording was played at: one beat lasts 60,000 / tempoBpm ms. */
  tempoBpm: number
  grid: QuantiseGrid
  /** The drill's key, to spell black keys with flats where it has them (`Bb major`); sharps otherwise. */
  key?: string | null
  /**
   * Beat 0 of a metronome that clicked while the drill was played (performance.now() ms): onsets are
   * read against its beats, and the drill starts on the whole beat before its first note, so a note
   * played off the beat stays off it. Without a metronome the first note is beat 0.
   */
  originMs?: number
}

function spelling(key: string | null | undefined): Spelling {
  if (!key) return 'sharps'
  try {
    return spellingForKey(key)
  }
  catch {
    return 'sharps'
  }
}

/**
 * The recorded notes as drill notes: every onset and release snapped to the nearest grid step, each
 * note at least one step long, the first note at beat 0 (or, against a metronome, within beat 0). A key
 * struck twice onto the same step (a bounce) is one note, the longer.
 */
export function quantiseRecording(notes: readonly RecordedNote[], options: QuantiseOptions): DrillNote[] {
  if (notes.length === 0) return []
  const steps = QUANTISE_GRIDS[options.grid].stepsPerBeat
  const beatMs = 60_000 / options.tempoBpm
  const origin = options.originMs ?? Math.min(...notes.map(n => n.onMs))
  const toStep = (ms: number): number => Math.round(((ms - origin) / beatMs) * steps)
  const snapped = notes.map(n => ({ midi: n.midi, on: toStep(n.onMs), off: toStep(n.offMs) }))
  const first = Math.min(...snapped.map(n => n.on))
  const shift = options.originMs === undefined ? first : Math.floor(first / steps) * steps
  const spell = spelling(options.key)
  const byStep = new Map<string, DrillNote>()
  for (const n of snapped) {
    const on = n.on - shift
    const off = Math.max(on + 1, n.off - shift)
    const note: DrillNote = {
      pitch: nameFromMidi(n.midi, spell),
      beat: on / steps,
      length: Math.min(MAX_LENGTH_BEATS, (off - on) / steps),
    }
    const key = `${n.midi}@${on}`
    const earlier = byStep.get(key)
    if (!earlier || earlier.length < note.length) byStep.set(key, note)
  }
  return [...byStep.values()].sort((a, b) => a.beat - b.beat || midiFromName(a.pitch) - midiFromName(b.pitch))
}
