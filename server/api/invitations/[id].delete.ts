import { IdParams } from '#shared/types/drillSet'

// Withdraws an invitation not yet accepted: its link then answers 410 with a word from the teacher.
export default defineEventHandler(async (event) => {
  const teacher = await requireRole(event, 'teacher')
  const { id } = validParams(event, IdParams)
  await revokeInvitation(useDb(), teacher.id, id)
  setResponseStatus(event, 204)
  return null
})
