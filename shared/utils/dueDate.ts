import { TZDate } from '@date-fns/tz'

function pad(n: number): string {
  return String(n).padStart(2, '0')
}

/** Whether `zone` is an IANA time zone this runtime knows (e.g. "Europe/Lisbon", "UTC"). */
export function isTimeZone(zone: string): boolean {
  try {
    new Intl.DateTimeFormat('en', { timeZone: zone })
    return true
  }
  catch {
    return false
  }
}

/** Today's calendar date (YYYY-MM-DD) in `zone`. */
export function todayIn(zone: string, now: number = Date.now()): string {
  const d = new TZDate(now, zone)
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`
}

/** The instant the clock in `zone` reads the given time on the calendar day `day` (YYYY-MM-DD). */
function onClock(day: string, zone: string, h: number, min: number, s: number, ms: number): Date {
  const [y, m, d] = day.split('-').map(Number) as [number, number, number]
  return new Date(new TZDate(y, m - 1, d, h, min, s, ms, zone).getTime())
}

/** The instant the calendar day `day` (YYYY-MM-DD) begins in `zone`, daylight-saving changes included. */
export function startOfDayIn(day: string, zone: string): Date {
  return onClock(day, zone, 0, 0, 0, 0)
}

/**
 * The last millisecond of the calendar day `dueOn` (YYYY-MM-DD) in `zone`: an assignment due on
 * Friday is on time all of Friday where the teacher lives, daylight-saving changes included.
 */
export function endOfDueDay(dueOn: string, zone: string): Date {
  return onClock(dueOn, zone, 23, 59, 59, 999)
}
