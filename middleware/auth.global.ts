// Signed-out visitors go to sign-in; each role has its own home. The server checks roles again on every API call.
const PUBLIC_PAGES = new Set(['/login', '/signup', '/forgot-password', '/join'])
// Pages that e-mailed links open: they work signed in or out, and for a guardian who has no account.
const LINK_PAGES = new Set(['/reset-password', '/confirm-email', '/unsubscribe', '/invitation'])
const ROLE_HOME = { teacher: '/teacher', student: '/student', admin: '/teacher' } as const

export default defineNuxtRouteMiddleware((to) => {
  if (LINK_PAGES.has(to.path)) return
  const { loggedIn, user } = useUserSession()
  if (!loggedIn.value || !user.value) {
    return PUBLIC_PAGES.has(to.path) ? undefined : navigateTo({ path: '/login', query: to.path === '/' ? {} : { next: to.fullPath } })
  }
  const home = ROLE_HOME[user.value.role]
  if (to.path === '/' || PUBLIC_PAGES.has(to.path)) return navigateTo(home)
  const area = to.path.split('/')[1]
  if ((area === 'teacher' && user.value.role === 'student') || (area === 'student' && user.value.role !== 'student')) {
    return navigateTo(home)
  }
})
