import { TokenInput } from '#shared/types/account'

// Open to anyone holding the link: the link itself proves the address. A session of the same account is updated.
export default defineEventHandler(async (event) => {
  const { token } = await validBody(event, TokenInput)
  const user = await confirmEmailChange(token)
  const session = await getUserSession(event)
  if (session.user?.id === user.id) await setUserSession(event, { user: { ...session.user, email: user.email } })
  return { email: user.email }
})
