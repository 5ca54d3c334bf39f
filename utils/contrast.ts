// Colour contrast as defined by WCAG 2.1 (success criteria 1.4.3 and 1.4.11, "relative luminance"
// and "contrast ratio" in its glossary), used to choose and check text colours on finger hues.

/** Relative luminance of a `#rrggbb` colour (WCAG 2.1 glossary, sRGB linearisation). */
export function relativeLuminance(hex: string): number {
  const match = /^#([0-9a-f]{6})$/i.exec(hex)
  if (!match) throw new Error(`Expected a #rrggbb colour, got ${hex}`)
  const value = Number.parseInt(match[1]!, 16)
  const [r, g, b] = [value >> 16, (value >> 8) & 0xff, value & 0xff].map((channel) => {
    const c = channel / 255
    return c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4
  }) as [number, number, number]
  return 0.2126 * r + 0.7152 * g + 0.0722 * b
}

/** Contrast ratio between two colours, from 1 (none) to 21 (black on white). */
export function contrastRatio(a: string, b: string): number {
  const [light, dark] = [relativeLuminance(a), relativeLuminance(b)].sort((x, y) => y - x) as [number, number]
  return (light + 0.05) / (dark + 0.05)
}
