// Every API route needs a live session except these; role checks live in each handler (requireRole).
const OPEN_ROUTES = new Set(['/api/health', '/api/auth/login', '/api/auth/register', '/api/auth/logout', '/api/auth/forgot', '/api/auth/reset', '/api/auth/confirm-email', '/api/guardian/unsubscribe', '/api/invitations/lookup', '/api/invitations/accept', '/api/_auth/session'])

export default defineEventHandler(async (event) => {
  const path = routePath(event)
  if (!path.startsWith('/api/') || path === '/api/health') return
  // A cookie whose session row has ended is cleared here, so even the open routes see it signed out.
  await checkSession(event)
  if (OPEN_ROUTES.has(path)) return
  await requireUserSession(event)
})
