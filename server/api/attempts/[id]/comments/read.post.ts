import { AttemptParams } from '../../../../utils/attempts'

/** The student has opened the attempt: its comments stop counting as new. Only the attempt's own student marks them. */
export default defineEventHandler(async (event) => {
  const student = await requireRole(event, 'student')
  const { id } = validParams(event, AttemptParams)
  const db = useDb()
  const attempt = await db('attempts').where({ id }).first('student_id')
  if (!attempt || Number(attempt.student_id) !== student.id) {
    throw createError({ statusCode: 404, statusMessage: 'Not found', message: 'Attempt not found' })
  }
  const marked = await db('comments').where({ attempt_id: id }).whereNull('read_at').update({ read_at: db.fn.now(3) })
  return { marked }
})
