import { z } from 'zod'

const Params = z.object({ id: z.uuid({ error: 'id: not an attempt id' }) })

export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const { id } = validParams(event, Params)
  const db = useDb()
  const attempt = await loadAttempt(db, id)
  // A hidden attempt answers like a missing one, so ids of other students' attempts reveal nothing.
  if (!attempt || !(await mayReadStudent(db, user, attempt.studentId))) {
    throw createError({ statusCode: 404, statusMessage: 'Not found', message: 'Attempt not found' })
  }
  return { attempt }
})
