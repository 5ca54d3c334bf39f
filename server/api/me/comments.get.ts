import { z } from 'zod'

const Query = z.object({ limit: z.coerce.number().int().min(1).max(50).default(5) })

/** The teacher's latest comments on the signed-in student's attempts, newest first, with how many are unread. */
export default defineEventHandler(async (event) => {
  const student = await requireRole(event, 'student')
  const { limit } = validQuery(event, Query)
  const db = useDb()
  const mine = () => db('comments as c').join('attempts as a', 'a.id', 'c.attempt_id').where('a.student_id', student.id)
  const [rows, unread] = await Promise.all([
    mine().join('drills as d', 'd.id', 'a.drill_id').join('users as u', 'u.id', 'c.teacher_id')
      .orderBy([{ column: 'c.created_at', order: 'desc' }, { column: 'c.id', order: 'desc' }]).limit(limit)
      .select('c.id', 'c.body', 'c.created_at', 'c.read_at', 'a.id as attempt_id', 'a.started_at', 'd.title', 'u.name'),
    mine().whereNull('c.read_at').count({ n: '*' }),
  ])
  return {
    unread: Number(unread[0]?.n ?? 0),
    comments: rows.map((r: Record<string, unknown>) => ({
      id: Number(r.id),
      body: String(r.body),
      createdAt: new Date(r.created_at as string).toISOString(),
      unread: r.read_at == null,
      attemptId: String(r.attempt_id),
      attemptStartedAt: new Date(r.started_at as string).toISOString(),
      drillTitle: String(r.title),
      teacherName: String(r.name),
    })),
  }
})
