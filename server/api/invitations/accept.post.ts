import { InvitationAccept } from '#shared/types/classes'

// The invited student makes an account (or signs in to theirs) and is in the class, signed in.
export default defineEventHandler(async (event) => {
  const input = await validBody(event, InvitationAccept)
  const { user, classId } = await acceptInvitation(useDb(), input)
  await startSession(event, user)
  return { user, classId }
})
