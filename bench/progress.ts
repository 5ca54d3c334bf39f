// The progress and habits routes for one student with 2,000 stored attempts, timed from the test
// stack's server over loopback (so each figure is the server's time plus well under a millisecond of
// HTTP on this machine). Figures only, never asserted: the machine is shared.
import { randomUUID } from 'node:crypto'
import { hashPassword } from '../scripts/lib/password'
import { attemptRowCopier } from '../tests/support/attempts'
import { Client, closeTestDb, testDb } from '../tests/support/server'
import { ROUTE_RUNS, ROUTE_WARM_UP, timeRoute } from './routes'

const ATTEMPTS = 2000
const DAY_MS = 86_400_000

/** A student of the demo teacher's Tuesday class whose history is the demo student's attempts, copied to 2,000 over 400 days. */
async function benchStudent(): Promise<{ id: number, email: string, busiest: number }> {
  const db = testDb()
  const email = `bench-${Date.now()}@evenhand.test`
  const [id] = await db('users').insert({ email, name: 'Bench Student', role: 'student', password_hash: await hashPassword('bench-password-1') })
  const cls = await db('classes').where({ name: 'Tuesday Starters' }).first('id')
  await db('class_members').insert({ class_id: cls.id, student_id: id })
  const source = await db('attempts as a').join('users as u', 'u.id', 'a.student_id').where('u.email', 'student@evenhand.test').select('a.*')
  const copy = await attemptRowCopier(db)
  const now = Date.now()
  const rows = Array.from({ length: ATTEMPTS }, (_, k) => {
    const a = source[k % source.length]!
    const startedAt = new Date(now - (400 * DAY_MS * (ATTEMPTS - k)) / ATTEMPTS)
    return { ...copy(a), id: randomUUID(), student_id: id, assignment_id: null, started_at: startedAt, created_at: startedAt }
  })
  for (let k = 0; k < rows.length; k += 200) await db('attempts').insert(rows.slice(k, k + 200))
  const busiest = await db('attempts').where('student_id', id).groupBy('drill_id').orderByRaw('COUNT(*) DESC').first('drill_id', db.raw('COUNT(*) AS n'))
  console.log(`bench student: ${ATTEMPTS} attempts over 400 days, ${busiest.n} of them on the busiest drill`)
  return { id: Number(id), email, busiest: Number(busiest.drill_id) }
}

export async function benchProgress(): Promise<void> {
  const student = await benchStudent()
  const client = await new Client().signIn(student.email, 'bench-password-1')
  console.log(`progress and habits routes, ${ROUTE_RUNS} sequential requests each after ${ROUTE_WARM_UP} to warm up:`)
  await timeRoute(client, `/api/me/progress?drill=${student.busiest}`)
  await timeRoute(client, `/api/me/progress?drill=${student.busiest}&range=3m`)
  await timeRoute(client, '/api/me/progress')
  await timeRoute(client, `/api/students/${student.id}/progress?drill=${student.busiest}`)
  await timeRoute(client, `/api/students/${student.id}/habits?range=all`)
  await timeRoute(client, `/api/students/${student.id}/habits`)
  await closeTestDb()
}

if (import.meta.url === `file://${process.argv[1]}`) await benchProgress()
