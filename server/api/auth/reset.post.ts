import { ResetInput } from '#shared/types/account'

// A working link proves the address, so the new password also signs the person in.
export default defineEventHandler(async (event) => {
  const { token, password } = await validBody(event, ResetInput)
  const user = await resetPassword(token, password)
  await setUserSession(event, { user, loggedInAt: Date.now() })
  return { user }
})
