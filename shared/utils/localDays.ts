import { TZDate } from '@date-fns/tz'

const DAY_MS = 86_400_000
const MINUTE_MS = 60_000

/** A time zone's offset from UTC as minutes east, from an instant on: the zone's history over a span. */
export interface OffsetChange {
  fromMs: number
  offsetMinutes: number
}

/** `zone`'s offset from UTC at `ms`, in minutes east (Lisbon in summer: 60). */
export function offsetAt(zone: string, ms: number): number {
  return -new TZDate(ms, zone).getTimezoneOffset()
}

/**
 * Every offset `zone` keeps between `fromMs` and `toMs`: the first from `fromMs`, then one per change
 * (daylight saving), each found to the millisecond. Zones change at most a few times a year and never twice
 * within a week, so a week's step finds each change and a bisection places it.
 */
export function offsetChanges(zone: string, fromMs: number, toMs: number): OffsetChange[] {
  const changes: OffsetChange[] = [{ fromMs, offsetMinutes: offsetAt(zone, fromMs) }]
  for (let at = fromMs; at < toMs;) {
    const next = Math.min(toMs, at + 7 * DAY_MS)
    const before = changes.at(-1)!.offsetMinutes
    const after = offsetAt(zone, next)
    if (after !== before) {
      let low = at
      let high = next
      while (high - low > 1) {
        const mid = Math.floor((low + high) / 2)
        if (offsetAt(zone, mid) === before) low = mid
        else high = mid
      }
      changes.push({ fromMs: high, offsetMinutes: after })
    }
    at = next
  }
  return changes
}

/** The calendar day (YYYY-MM-DD) `days` after `day` (before, when negative). */
export function addDays(day: string, days: number): string {
  return new Date(Date.parse(`${day}T00:00:00Z`) + days * DAY_MS).toISOString().slice(0, 10)
}

/** The calendar day (YYYY-MM-DD) of instant `ms` at `offsetMinutes` east of UTC. */
export function dayAtOffset(ms: number, offsetMinutes: number): string {
  return new Date(ms + offsetMinutes * MINUTE_MS).toISOString().slice(0, 10)
}

/** The cookie in which the browser names its IANA time zone for the server (plugins/time-zone.client.ts). */
export const TIME_ZONE_COOKIE = 'evenhand_tz'
