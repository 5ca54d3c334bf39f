import { PasswordChange } from '#shared/types/account'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const { currentPassword, password } = await validBody(event, PasswordChange)
  requireGoodPassword(password, user.email)
  const db = useDb()
  await requireCurrentPassword(db, user.id, currentPassword)
  await db('users').where({ id: user.id }).update({ password_hash: await hashPassword(password) })
  // A reset link sent earlier must not undo the password just chosen.
  await retireTokens(db, user.id, 'password-reset')
  // A new password ends every other session; this browser goes on in a fresh one.
  await endSessionsOf(user.id)
  await startSession(event, user)
  return { ok: true }
})
