import type { H3Event } from 'h3'
import { TIME_ZONE_COOKIE } from '#shared/utils/localDays'
import { isTimeZone } from '#shared/utils/dueDate'

/** The IANA time zone the browser named in its cookie, when it is one this runtime knows (and fits `users.time_zone`). */
export function browserTimeZone(event: H3Event): string | null {
  const zone = getCookie(event, TIME_ZONE_COOKIE)
  return zone && zone.length <= 64 && isTimeZone(zone) ? zone : null
}
