// Where keys are: the black/white pattern and each key's horizontal place on a real keyboard.

/** Pitch classes of the black keys (C♯, D♯, F♯, G♯, A♯). */
const BLACK_PITCH_CLASSES = new Set([1, 3, 6, 8, 10])

/** Width of a white key at its front edge, in mm (a common modern piano measurement, from memory). */
export const WHITE_KEY_MM = 23.5

export function isBlackKey(midi: number): boolean {
  return BLACK_PITCH_CLASSES.has(((midi % 12) + 12) % 12)
}

/** How many white keys lie below this key's pitch class within its octave. */
const WHITE_BELOW = [0, 1, 1, 2, 2, 3, 4, 4, 5, 5, 6, 6]

/**
 * The horizontal centre of a key in mm, measured from the left edge of C in octave -1 (MIDI 0).
 * A black key is centred on the boundary between its white neighbours, which is close enough
 * for span arithmetic (real black keys sit slightly off-centre).
 */
export function keyCenterMm(midi: number): number {
  const octave = Math.floor(midi / 12)
  const pc = midi - octave * 12
  const whites = octave * 7 + WHITE_BELOW[pc]!
  return isBlackKey(midi) ? whites * WHITE_KEY_MM : (whites + 0.5) * WHITE_KEY_MM
}
