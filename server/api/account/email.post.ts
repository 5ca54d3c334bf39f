import { EmailChange } from '#shared/types/account'

// 202: nothing changes until the link sent to the new address is followed.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const { email, currentPassword } = await validBody(event, EmailChange)
  await requireCurrentPassword(useDb(), user.id, currentPassword)
  if (email === user.email) {
    throw createError({ statusCode: 400, statusMessage: 'Invalid input', message: 'email: This is already your e-mail' })
  }
  await requestEmailChange(user.id, email)
  setResponseStatus(event, 202)
  return { message: `We sent a link to ${email}. Your sign-in e-mail changes when you open it (within 24 hours).` }
})
