import { ResetInput } from '#shared/types/account'

// A working link proves the address, so the new password also signs the person in; every older session ends.
export default defineEventHandler(async (event) => {
  const { token, password } = await validBody(event, ResetInput)
  requireGoodPassword(password)
  const user = await resetPassword(token, password)
  await endSessionsOf(user.id)
  await startSession(event, user)
  return { user }
})
