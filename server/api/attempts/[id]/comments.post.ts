import { z } from 'zod'
import { AttemptParams } from '../../../utils/attempts'

const CommentInput = z.object({ body: z.string().trim().min(1, { error: 'Write a comment first' }).max(4000) })

export default defineEventHandler(async (event) => {
  const teacher = await requireRole(event, 'teacher')
  const { id } = validParams(event, AttemptParams)
  const { body } = await validBody(event, CommentInput)
  const db = useDb()
  const attempt = await db('attempts').where({ id }).first('student_id')
  if (!attempt || !(await mayReadStudent(db, teacher, Number(attempt.student_id)))) {
    throw createError({ statusCode: 404, statusMessage: 'Not found', message: 'Attempt not found' })
  }
  const [commentId] = await db('comments').insert({ attempt_id: id, teacher_id: teacher.id, body })
  setResponseStatus(event, 201)
  return { comment: { id: Number(commentId), teacherId: teacher.id, teacherName: teacher.name, body, createdAt: new Date().toISOString() } }
})
