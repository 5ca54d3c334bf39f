// Geometry and shared state of the on-screen keyboard (components/keyboard/).
import { Midi, Note } from 'tonal'
import { isBlackKey, keyCenterMm, WHITE_KEY_MM } from '#shared/engine'

/** Black key width at the front, in mm (common modern grand/upright measurement). */
export const BLACK_KEY_MM = 13.7
/** Visible length of a white key, in mm. */
export const WHITE_LENGTH_MM = 150
/** Black keys are about 60 % as long as the white keys. */
export const BLACK_LENGTH_MM = 90

/**
 * Black key centres in mm from the left edge of the octave's C. Real keyboards do not centre
 * black keys on the white-key gaps: the back of C–E is cut into five equal slots and F–B into
 * seven, which puts C♯ and F♯ left of their gap, D♯ and A♯ right of it and G♯ on it.
 */
const GROUP_CDE = (3 * WHITE_KEY_MM) / 5
const GROUP_FGAB = (4 * WHITE_KEY_MM) / 7
const BLACK_CENTRE_IN_OCTAVE: Readonly<Record<number, number>> = {
  1: 1.5 * GROUP_CDE,
  3: 3.5 * GROUP_CDE,
  6: 3 * WHITE_KEY_MM + 1.5 * GROUP_FGAB,
  8: 3 * WHITE_KEY_MM + 3.5 * GROUP_FGAB,
  10: 3 * WHITE_KEY_MM + 5.5 * GROUP_FGAB,
}

/** Left edge of a key in mm from the left edge of MIDI 0. */
export function keyLeftMm(midi: number): number {
  if (!isBlackKey(midi)) return keyCenterMm(midi) - WHITE_KEY_MM / 2
  const octaveC = Math.floor(midi / 12) * 7 * WHITE_KEY_MM
  return octaveC + BLACK_CENTRE_IN_OCTAVE[midi % 12]! - BLACK_KEY_MM / 2
}

export interface KeyLayout {
  midi: number
  black: boolean
  /** `C♯4`, for the label drawn on the key. */
  name: string
  /** `C sharp 4`, for screen readers, which read ♯ unreliably. */
  spokenName: string
  /** Position and size as percentages of the keyboard's width. */
  leftPct: number
  widthPct: number
}

export interface KeyboardLayout {
  keys: KeyLayout[]
  whiteCount: number
  blackCount: number
  /** Width over height of the whole keyboard, to keep real proportions at any width. */
  aspectRatio: number
  /** Black key length as a percentage of the keyboard's height. */
  blackLengthPct: number
}

/** Lays out the keys from `low` to `high` (MIDI numbers, inclusive), white keys first so black ones draw on top. */
export function layoutKeyboard(low: number, high: number): KeyboardLayout {
  if (!(Number.isInteger(low) && Number.isInteger(high) && low >= 0 && high <= 127 && low <= high)) {
    throw new RangeError(`Expected a MIDI range low ≤ high within 0–127, got ${low}–${high}`)
  }
  const midis = Array.from({ length: high - low + 1 }, (_, i) => low + i)
  const width = (midi: number): number => (isBlackKey(midi) ? BLACK_KEY_MM : WHITE_KEY_MM)
  const start = Math.min(...midis.map(keyLeftMm))
  const totalMm = Math.max(...midis.map(m => keyLeftMm(m) + width(m))) - start
  const keys = midis.map((midi): KeyLayout => {
    const { letter, acc, oct } = Note.get(Midi.midiToNoteName(midi, { sharps: true }))
    return {
      midi,
      black: isBlackKey(midi),
      name: `${letter}${acc ? '♯' : ''}${oct}`,
      spokenName: `${letter}${acc ? ' sharp' : ''} ${oct}`,
      leftPct: ((keyLeftMm(midi) - start) / totalMm) * 100,
      widthPct: (width(midi) / totalMm) * 100,
    }
  }).sort((a, b) => Number(a.black) - Number(b.black) || a.midi - b.midi)
  const blackCount = keys.filter(k => k.black).length
  return {
    keys,
    whiteCount: keys.length - blackCount,
    blackCount,
    aspectRatio: totalMm / WHITE_LENGTH_MM,
    blackLengthPct: (BLACK_LENGTH_MM / WHITE_LENGTH_MM) * 100,
  }
}

/** What each key reads from its keyboard; every field is reactive so a key re-renders only when its own answer changes. */
export interface KeyboardState {
  isPressed: (midi: number) => boolean
  isTarget: (midi: number) => boolean
  startsPosition: (midi: number) => boolean
  planned: (midi: number) => readonly number[]
  inferred: (midi: number) => readonly number[]
  /** The key that holds the keyboard's single tab stop (roving tabindex). */
  focusMidi: Ref<number>
}

export const KEYBOARD_STATE: InjectionKey<KeyboardState> = Symbol('keyboard-state')

/** Fingers for keys, given either as a record `{ 60: 1 }` or as a list `[{ midi: 60, finger: 1 }]` (a key may repeat). */
export type KeyFingers = Readonly<Record<number, number>> | readonly { midi: number, finger: number }[]

export function fingersByKey(fingers: KeyFingers | undefined): Map<number, number[]> {
  const byKey = new Map<number, number[]>()
  const pairs = Array.isArray(fingers)
    ? (fingers as readonly { midi: number, finger: number }[]).map(f => [f.midi, f.finger] as const)
    : Object.entries(fingers ?? {}).map(([midi, finger]) => [Number(midi), finger] as const)
  for (const [midi, finger] of pairs) {
    const list = byKey.get(midi) ?? []
    if (!list.includes(finger)) list.push(finger)
    byKey.set(midi, list)
  }
  return byKey
}

/** Velocity from where on the key it was struck: 0 at the back, 1 at the front edge (louder nearer the player). */
export function velocityFromDepth(depth: number, soft = 40, loud = 120): number {
  const d = Math.min(Math.max(depth, 0), 1)
  return Math.round(soft + (loud - soft) * d)
}
