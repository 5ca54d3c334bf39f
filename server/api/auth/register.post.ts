import { RegisterInput } from '#shared/types/account'

// Sign-up makes teachers only: students join through a class code or an invitation, admins from the command line.
export default defineEventHandler(async (event) => {
  const input = await validBody(event, RegisterInput)
  const db = useDb()
  const passwordHash = await hashPassword(input.password)
  let id: number
  try {
    const [inserted] = await db('users').insert({ email: input.email, name: input.name, password_hash: passwordHash, role: 'teacher' })
    id = Number(inserted)
  }
  catch (error) {
    if ((error as { code?: string }).code === 'ER_DUP_ENTRY') {
      throw createError({ statusCode: 409, statusMessage: 'Conflict', message: 'email: An account with this e-mail already exists' })
    }
    throw error
  }
  const user = { id, email: input.email, name: input.name, role: 'teacher' as const }
  await setUserSession(event, { user, loggedInAt: Date.now() })
  setResponseStatus(event, 201)
  return { user }
})
