import { InvitationLookup } from '#shared/types/classes'

// Open to anyone holding the link: which class it opens, and whether the address already has an account.
export default defineEventHandler(async (event) => {
  const { token } = validQuery(event, InvitationLookup)
  return { invitation: await previewInvitation(useDb(), token) }
})
