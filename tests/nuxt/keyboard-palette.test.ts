import { describe, expect, it } from 'vitest'
import { contrastRatio, relativeLuminance } from '~/utils/contrast'
import { FINGER_HUES } from '~/utils/fingerPalette'

// The eight colours of Okabe & Ito (2008), "Color Universal Design".
const OKABE_ITO = ['#000000', '#E69F00', '#56B4E9', '#009E73', '#F0E442', '#0072B2', '#D55E00', '#CC79A7']

describe('contrast (WCAG 2.1 relative luminance and contrast ratio)', () => {
  it.each([
    ['#000000', '#FFFFFF', 21],
    ['#FFFFFF', '#FFFFFF', 1],
    // WCAG 2.1's own threshold example: #767676 on white is the lightest grey that passes 4.5:1.
    ['#767676', '#FFFFFF', 4.54],
  ])('%s on %s is %d:1', (a, b, ratio) => {
    expect(contrastRatio(a, b)).toBeCloseTo(ratio, 2)
  })

  it('rejects colours it cannot read', () => {
    expect(() => relativeLuminance('red')).toThrow()
  })
})

describe('finger palette', () => {
  const fingers = [1, 2, 3, 4, 5] as const

  it.each(['light', 'dark'] as const)('has five distinct Okabe–Ito fills in %s mode', (mode) => {
    const fills = fingers.map(f => FINGER_HUES[f][mode].fill.toUpperCase())
    expect(new Set(fills).size).toBe(5)
    for (const fill of fills) expect(OKABE_ITO).toContain(fill)
  })

  // WCAG 2.1 success criterion 1.4.3 (Contrast, Minimum): at least 4.5:1 for normal text.
  it.each(fingers.flatMap(f => (['light', 'dark'] as const).map(mode => [f, mode] as const)))(
    'finger %i in %s mode has a number readable at 4.5:1 or more',
    (finger, mode) => {
      const { fill, text } = FINGER_HUES[finger][mode]
      expect(contrastRatio(fill, text)).toBeGreaterThanOrEqual(4.5)
    },
  )
})
