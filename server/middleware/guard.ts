// Every API route needs a session except these; role checks live in each handler (requireRole).
const OPEN_ROUTES = new Set(['/api/health', '/api/auth/login', '/api/auth/register', '/api/auth/logout', '/api/auth/forgot', '/api/auth/reset', '/api/auth/confirm-email', '/api/guardian/unsubscribe', '/api/invitations/lookup', '/api/invitations/accept', '/api/_auth/session'])

export default defineEventHandler(async (event) => {
  const path = event.path.split('?')[0]!
  if (!path.startsWith('/api/') || OPEN_ROUTES.has(path)) return
  await requireUserSession(event)
})
