import { AttemptPageQuery } from '#shared/types/progress'

/** One student's attempts, newest first, a page at a time, for their teacher (or the student); 403 for anyone else's. */
export default defineEventHandler(async (event) => {
  const { db, student, query } = await studentRequest(event, AttemptPageQuery)
  return studentAttempts(db, student, query.page)
})
