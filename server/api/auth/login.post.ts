import { LoginInput } from '#shared/types/account'

const WRONG = 'Wrong e-mail or password'

export default defineEventHandler(async (event) => {
  const { email, password } = await validBody(event, LoginInput)
  const row = await useDb()('users').where({ email }).first('id', 'email', 'name', 'role', 'password_hash')
  // One message for an unknown e-mail and a wrong password, so sign-in does not reveal who has an account.
  if (!row?.password_hash || !(await verifyPassword(row.password_hash, password))) {
    throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: WRONG })
  }
  const user = { id: Number(row.id), email: row.email, name: row.name, role: row.role }
  await setUserSession(event, { user, loggedInAt: Date.now() })
  return { user }
})
