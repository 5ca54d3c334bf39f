import { IdParams } from '#shared/types/drillSet'

// A new link with a fresh 7 days; the link sent before stops working.
export default defineEventHandler(async (event) => {
  const teacher = await requireRole(event, 'teacher')
  const { id } = validParams(event, IdParams)
  await resendInvitation(useDb(), teacher.id, id)
  return { ok: true }
})
