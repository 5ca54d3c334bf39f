import { AccountUpdate } from '#shared/types/account'

// Name for everyone; the guardian address only for a student's own account.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const input = await validBody(event, AccountUpdate)
  if (input.guardianEmail !== undefined && user.role !== 'student') {
    throw createError({ statusCode: 400, statusMessage: 'Invalid input', message: 'guardianEmail: Only a student account has a guardian' })
  }
  const db = useDb()
  if (input.name !== undefined) {
    await db('users').where({ id: user.id }).update({ name: input.name })
    await setUserSession(event, { user: { ...user, name: input.name } })
  }
  if (input.guardianEmail !== undefined) await setGuardianEmail(db, user.id, input.guardianEmail)
  return { account: await loadAccount(db, user.id) }
})
