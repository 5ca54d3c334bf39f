import { ForgotInput } from '#shared/types/account'

// 202 whatever the address: the answer never tells whether an account uses it.
export default defineEventHandler(async (event) => {
  const { email } = await validBody(event, ForgotInput)
  await sendPasswordReset(email)
  setResponseStatus(event, 202)
  return { message: 'If an Evenhand account uses this address, a link to choose a new password is on its way. It works for one hour.' }
})
