import { ForgotInput } from '#shared/types/account'

// 202 whatever the address: the answer never tells whether an account uses it. The per-address limit
// counts unknown addresses exactly as known ones, so a 429 tells nothing either.
export default defineEventHandler(async (event) => {
  const { email } = await validBody(event, ForgotInput)
  await spend(event, 'forgotIp', clientIp(event), 'Too many password links asked for from this address; try again later')
  await spend(event, 'forgotAddress', email, 'Too many password links asked for this e-mail; look for the last one, or try again later')
  await sendPasswordReset(email)
  setResponseStatus(event, 202)
  return { message: 'If an Evenhand account uses this address, a link to choose a new password is on its way. It works for one hour.' }
})
