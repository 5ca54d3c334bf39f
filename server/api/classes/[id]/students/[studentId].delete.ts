import { z } from 'zod'
import { Id } from '#shared/types/drillSet'

const Params = z.object({ id: Id, studentId: Id })

// Takes the student out of the class only: their attempts stay theirs, and so do other classes.
export default defineEventHandler(async (event) => {
  const teacher = await requireRole(event, 'teacher')
  const { id, studentId } = validParams(event, Params)
  const db = useDb()
  await ownClass(db, teacher.id, id)
  const removed = await db('class_members').where({ class_id: id, student_id: studentId }).delete()
  if (!removed) throw createError({ statusCode: 404, statusMessage: 'Not found', message: 'This student is not in the class' })
  setResponseStatus(event, 204)
  return null
})
