import type { H3Event } from 'h3'
import type { User } from '#auth-utils'
import type { Role } from '#shared/types/account'

/** The signed-in user, who must hold one of `roles`: 401 when signed out, 403 for another role. */
export async function requireRole(event: H3Event, ...roles: Role[]): Promise<User> {
  const { user } = await requireUserSession(event)
  if (roles.length && !roles.includes(user.role)) {
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: 'Your account may not do this' })
  }
  return user
}
