import { ProgressQuery, StudentParams } from '#shared/types/progress'

/** One student's progress for their teacher (or the student): as `/api/me/progress`, 403 for anyone else's student. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const { id } = validParams(event, StudentParams)
  const query = validQuery(event, ProgressQuery)
  return studentProgress(event, user, id, query)
})
