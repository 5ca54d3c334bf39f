import { AttemptPageQuery, StudentParams } from '#shared/types/progress'

/** One student's attempts, newest first, a page at a time, for their teacher (or the student); 403 for anyone else's. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const { id } = validParams(event, StudentParams)
  const { page } = validQuery(event, AttemptPageQuery)
  const db = useDb()
  const student = await readableStudent(db, user, id)
  setResponseHeader(event, 'cache-control', 'private, no-store')
  return studentAttempts(db, student, page)
})
