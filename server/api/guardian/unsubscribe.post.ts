import { TokenInput } from '#shared/types/account'

// Open to anyone holding the link (the guardian has no account). Following it again is harmless.
export default defineEventHandler(async (event) => {
  const { token } = await validBody(event, TokenInput)
  const student = await stopGuardianSummary(token)
  return { message: `You will no longer receive the weekly summary of ${student.name}'s practice.` }
})
