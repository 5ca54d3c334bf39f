// Where the seeded demo studio's own pages are, for tests that visit every main page as its teacher and student.
import { testDb } from './server'

export interface DemoPaths {
  classId: number
  setId: number
  /** Noor's (student@evenhand.test) latest attempt, and its drill. */
  attemptId: string
  drillId: number
  studentId: number
}

export async function demoPaths(): Promise<DemoPaths> {
  const db = testDb()
  const noor = await db('users').where({ email: 'student@evenhand.test' }).first('id')
  const attempt = await db('attempts').where({ student_id: noor.id }).orderBy('created_at', 'desc').first('id', 'drill_id')
  const klass = await db('classes').where({ name: 'Tuesday Starters' }).first('id')
  const set = await db('drill_sets').orderBy('id').first('id')
  return { classId: Number(klass.id), setId: Number(set.id), attemptId: String(attempt.id), drillId: Number(attempt.drill_id), studentId: Number(noor.id) }
}
