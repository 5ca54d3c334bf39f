import { z } from 'zod'

const Query = z.object({
  drill: z.coerce.number().int().positive().optional(),
  student: z.coerce.number().int().positive().optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
})

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'student', 'teacher', 'admin')
  const { drill, student, limit } = validQuery(event, Query)
  const db = useDb()
  const q = db('attempts').select(SUMMARY_COLUMNS).orderBy('started_at', 'desc').limit(limit)
  if (drill) q.where('drill_id', drill)
  if (user.role === 'student') {
    if (student && student !== user.id) throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: 'Students see only their own attempts' })
    q.where('student_id', user.id)
  }
  else if (user.role === 'teacher') {
    q.whereIn('student_id', taughtStudentIds(db, user.id))
    if (student) q.where('student_id', student)
  }
  else if (student) {
    q.where('student_id', student)
  }
  return { attempts: (await q).map(toAttemptSummary) }
})
