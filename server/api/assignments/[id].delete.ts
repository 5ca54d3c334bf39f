import { IdParams } from '#shared/types/drillSet'

// Withdraws the assignment; attempts played for it stay with the student (their link is cleared).
export default defineEventHandler(async (event) => {
  const teacher = await requireRole(event, 'teacher')
  const { id } = validParams(event, IdParams)
  const db = useDb()
  await ownAssignment(db, teacher.id, id)
  await db('assignments').where({ id, assigned_by: teacher.id }).delete()
  setResponseStatus(event, 204)
  return null
})
