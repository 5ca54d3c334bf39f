import { TIME_ZONE_COOKIE } from '#shared/utils/localDays'

// The server cannot know the browser's time zone, and a student's practice days must be their own even
// on a server-rendered page: the browser names its zone in a cookie, which signing in keeps on the account.
export default defineNuxtPlugin({
  name: 'time-zone',
  setup() {
    const zone = useCookie(TIME_ZONE_COOKIE, { maxAge: 400 * 86_400, sameSite: 'lax', path: '/' })
    const mine = Intl.DateTimeFormat().resolvedOptions().timeZone
    if (mine && zone.value !== mine) zone.value = mine
  },
})
