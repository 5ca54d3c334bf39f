import { InvitationInput } from '#shared/types/classes'
import { IdParams } from '#shared/types/drillSet'

// Invites each address by e-mail; an address already in the class is a 409 and nobody is e-mailed.
export default defineEventHandler(async (event) => {
  const teacher = await requireRole(event, 'teacher')
  const { id } = validParams(event, IdParams)
  const { emails } = await validBody(event, InvitationInput)
  const db = useDb()
  const ids = await inviteToClass(db, teacher, id, emails)
  const { invitations } = await classDetail(db, teacher.id, id)
  setResponseStatus(event, 201)
  return { invitations: invitations.filter(i => ids.includes(i.id)) }
})
