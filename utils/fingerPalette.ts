// Finger colours: five hues of the Okabe–Ito colour-blind-safe palette (Okabe & Ito 2008,
// "Color Universal Design"), one per finger, each always drawn with the finger's number so
// colour is never the only signal. Charts and the keyboard both read this one table.
// Okabe–Ito yellow (#F0E442) is kept out of the fingers: the keyboard uses it for pressed keys.
// Text colours were chosen for WCAG 2.1 contrast of at least 4.5:1 (tests/nuxt/keyboard-palette.test.ts).

export interface FingerColour {
  /** Badge fill. */
  fill: string
  /** Text (the finger's number) on the fill. */
  text: string
}

export interface FingerHue {
  name: string
  light: FingerColour
  /** On dark backgrounds the dark blue sinks into the page, so finger 1 swaps to Okabe–Ito sky blue. */
  dark: FingerColour
}

export const FINGER_HUES: Readonly<Record<1 | 2 | 3 | 4 | 5, FingerHue>> = {
  1: { name: 'blue', light: { fill: '#0072B2', text: '#FFFFFF' }, dark: { fill: '#56B4E9', text: '#000000' } },
  2: { name: 'orange', light: { fill: '#E69F00', text: '#000000' }, dark: { fill: '#E69F00', text: '#000000' } },
  3: { name: 'bluish green', light: { fill: '#009E73', text: '#000000' }, dark: { fill: '#009E73', text: '#000000' } },
  4: { name: 'reddish purple', light: { fill: '#CC79A7', text: '#000000' }, dark: { fill: '#CC79A7', text: '#000000' } },
  5: { name: 'vermillion', light: { fill: '#D55E00', text: '#000000' }, dark: { fill: '#D55E00', text: '#000000' } },
}

export type PaletteFinger = keyof typeof FINGER_HUES

export function isPaletteFinger(n: number): n is PaletteFinger {
  return Number.isInteger(n) && n >= 1 && n <= 5
}

/**
 * CSS custom properties for one finger, light and dark; components pick the pair with
 * `prefers-color-scheme` in CSS, so the theme follows the system without JavaScript.
 */
export function fingerStyle(finger: PaletteFinger): Record<string, string> {
  const { light, dark } = FINGER_HUES[finger]
  return {
    '--finger-fill': light.fill,
    '--finger-text': light.text,
    '--finger-fill-dark': dark.fill,
    '--finger-text-dark': dark.text,
  }
}
