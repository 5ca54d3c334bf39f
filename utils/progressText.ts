// Sentences that say in words what a progress chart shows, so the page reads without the chart.
import type { TrendLine } from '#shared/types/progress'

export interface FigureWords {
  /** Such as "timing spread". */
  name: string
  unit: string
  values: (number | null)[]
  trend?: TrendLine
  target?: number | null
  /** For spreads, smaller is better; for scores and tempo, larger. */
  lowerIsBetter?: boolean
  digits?: number
}

export function describeFigure(f: FigureWords): string {
  const present = f.values.filter((v): v is number => v !== null)
  if (!present.length) return `No ${f.name} in this period.`
  const fmt = (v: number): string => `${v.toFixed(f.digits ?? 0)} ${f.unit}`
  const parts = [`Latest ${f.name} ${fmt(present.at(-1)!)}, first ${fmt(present[0]!)}, over ${present.length} attempt${present.length === 1 ? '' : 's'}.`]
  if (f.trend) {
    const step = f.trend.perWeek
    const better = f.lowerIsBetter ? step < 0 : step > 0
    parts.push(Math.abs(step) < 10 ** -(f.digits ?? 0) / 2
      ? 'The trend is flat.'
      : `The trend ${step > 0 ? 'rises' : 'falls'} ${fmt(Math.abs(step))} a week${better ? ', the right way' : ''}.`)
  }
  if (f.target != null) {
    // Compared as shown, so "63 bpm" against a target of 63 reads as reached.
    const shown = Number(present.at(-1)!.toFixed(f.digits ?? 0))
    const reached = f.lowerIsBetter ? shown <= f.target : shown >= f.target
    parts.push(`Target ${fmt(f.target)}: ${reached ? 'reached' : 'not reached yet'}.`)
  }
  return parts.join(' ')
}
