// Spelled pitch names and MIDI numbers. tonal does the music theory; this module adds the
// strictness a drill needs (one accepted spelling shape, the MIDI range, clear errors).
import { Key, Note } from 'tonal'

export { isBlackKey, keyCenterMm } from './keys'

/** The shape DrillNote accepts: letter, up to two sharps or flats, octave -1 to 9 (C4 = MIDI 60). */
const NAME_SHAPE = /^([A-Ga-g])(#{1,2}|b{1,2})?(-1|\d)$/

export class PitchError extends Error {
  override name = 'PitchError'
}

/** Names already read; grading reads every drill note's name on every attempt. */
const known = new Map<string, number>()
const KNOWN_LIMIT = 2048

/** The MIDI number of a spelled name such as `C4`, `F##4`, `Cb5` or `Bb3`. */
export function midiFromName(name: string): number {
  const cached = known.get(name)
  if (cached !== undefined) return cached
  const match = NAME_SHAPE.exec(name.trim())
  if (!match) throw new PitchError(`"${name}" is not a pitch: expected a letter A–G, an optional # ## b or bb, and an octave -1 to 9, such as C4, F#3 or Bb5`)
  const midi = Note.midi(`${match[1]!.toUpperCase()}${match[2] ?? ''}${match[3]}`)
  if (midi === null || midi < 0 || midi > 127) throw new PitchError(`"${name}" lies outside the MIDI range C-1 to G9`)
  if (known.size < KNOWN_LIMIT) known.set(name, midi)
  return midi
}

/** The same name in the canonical form the engine writes (upper-case letter). */
export function normalizeName(name: string): string {
  midiFromName(name)
  const trimmed = name.trim()
  return `${trimmed[0]!.toUpperCase()}${trimmed.slice(1)}`
}

/** A MIDI number or a name, as the command line and the importers receive them. */
export function toMidi(pitch: number | string): number {
  if (typeof pitch === 'string') return midiFromName(pitch)
  if (!Number.isInteger(pitch) || pitch < 0 || pitch > 127) throw new PitchError(`${pitch} is not a MIDI note number (0 to 127)`)
  return pitch
}

export type Spelling = 'sharps' | 'flats'

/**
 * Whether a key signature is written with flats. Accepts `F`, `Eb`, `Bb major`, `d minor`, `F#m`;
 * C major and A minor count as sharps, as is usual for chromatic notes without a signature.
 */
export function spellingForKey(key: string): Spelling {
  const match = /^\s*([A-Ga-g](?:#|b)?)\s*(m|min|minor|maj|major)?\s*$/.exec(key)
  if (!match) throw new PitchError(`"${key}" is not a key: expected a tonic such as F, Eb or F#, optionally followed by major or minor`)
  const tonic = match[1]![0]!.toUpperCase() + match[1]!.slice(1)
  const minor = match[2] !== undefined && match[2].startsWith('m') && !match[2].startsWith('maj')
  const alteration = minor ? Key.minorKey(tonic).alteration : Key.majorKey(tonic).alteration
  return alteration < 0 ? 'flats' : 'sharps'
}

/** A name for a MIDI number, spelled with sharps or flats, or as fits the given key. */
export function nameFromMidi(midi: number, spelling: Spelling | { key: string } = 'sharps'): string {
  toMidi(midi)
  const use = typeof spelling === 'string' ? spelling : spellingForKey(spelling.key)
  return use === 'flats' ? Note.fromMidi(midi) : Note.fromMidiSharps(midi)
}

/** Equal-tempered frequency in Hz with A4 (MIDI 69) at the given reference. */
export function frequency(pitch: number | string, a4Hz = 440): number {
  return a4Hz * 2 ** ((toMidi(pitch) - 69) / 12)
}
