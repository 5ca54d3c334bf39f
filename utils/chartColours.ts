/** Axis text and grid lines for charts, matching the page's ink in light and dark mode. */
export function chartColours(dark: boolean): { ink: string, grid: string } {
  return dark
    ? { ink: '#b5bcc6', grid: 'rgba(181,188,198,0.12)' }
    : { ink: '#4a5868', grid: 'rgba(74,88,104,0.12)' }
}

/** What every chart here shares: it fills its box and draws at once, without animation (a running one keeps the page painting). */
export const CHART_BASE = { responsive: true, maintainAspectRatio: false, animation: false } as const
