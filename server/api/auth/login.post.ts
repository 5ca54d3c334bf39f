import { LoginInput } from '#shared/types/account'

const WRONG = 'Wrong e-mail or password'
const LIMITED = 'Too many failed sign-ins; wait a little and try again'

export default defineEventHandler(async (event) => {
  const { email, password } = await validBody(event, LoginInput)
  const ip = clientIp(event)
  await refuseWhenSpent(event, 'signInIp', ip, LIMITED)
  await refuseWhenSpent(event, 'signInAccount', email, LIMITED)
  const user = await checkPassword(email, password)
  // One message for an unknown e-mail and a wrong password, and the same work for both, so sign-in does not reveal who has an account.
  if (!user) {
    await Promise.all([spendQuietly(event, 'signInIp', ip), spendQuietly(event, 'signInAccount', email)])
    throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: WRONG })
  }
  await forget(event, 'signInAccount', email)
  await startSession(event, user)
  return { user }
})
