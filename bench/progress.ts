// The progress and habits routes for one student with 2,000 stored attempts, timed from the test
// stack's server over loopback (so each figure is the server's time plus well under a millisecond of
// HTTP on this machine). Figures only, never asserted: the machine is shared.
import { randomUUID } from 'node:crypto'
import { hashPassword } from '../scripts/lib/password'
import { Client, closeTestDb, testDb } from '../tests/support/server'

const ATTEMPTS = 2000
const RUNS = 200
const WARM_UP = 20
const DAY_MS = 86_400_000

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)]!
}

/** A student of the demo teacher's Tuesday class whose history is the demo student's attempts, copied to 2,000 over 400 days. */
async function benchStudent(): Promise<{ id: number, email: string, busiest: number }> {
  const db = testDb()
  const email = `bench-${Date.now()}@evenhand.test`
  const [id] = await db('users').insert({ email, name: 'Bench Student', role: 'student', password_hash: await hashPassword('bench-password-1') })
  const cls = await db('classes').where({ name: 'Tuesday Starters' }).first('id')
  await db('class_members').insert({ class_id: cls.id, student_id: id })
  const source = await db('attempts as a').join('users as u', 'u.id', 'a.student_id').where('u.email', 'student@evenhand.test').select('a.*')
  const now = Date.now()
  const rows = Array.from({ length: ATTEMPTS }, (_, k) => {
    const a = source[k % source.length]
    const startedAt = new Date(now - (400 * DAY_MS * (ATTEMPTS - k)) / ATTEMPTS)
    return { ...a, id: randomUUID(), student_id: id, assignment_id: null, started_at: startedAt, created_at: startedAt }
  })
  for (let k = 0; k < rows.length; k += 200) await db('attempts').insert(rows.slice(k, k + 200))
  const busiest = await db('attempts').where('student_id', id).groupBy('drill_id').orderByRaw('COUNT(*) DESC').first('drill_id', db.raw('COUNT(*) AS n'))
  console.log(`bench student: ${ATTEMPTS} attempts over 400 days, ${busiest.n} of them on the busiest drill`)
  return { id: Number(id), email, busiest: Number(busiest.drill_id) }
}

async function time(client: Client, path: string): Promise<void> {
  for (let k = 0; k < WARM_UP; k++) await client.get(path)
  const ms: number[] = []
  for (let k = 0; k < RUNS; k++) {
    const t = performance.now()
    const res = await client.get(path)
    ms.push(performance.now() - t)
    if (res.status !== 200) throw new Error(`${path}: ${res.status}`)
  }
  ms.sort((a, b) => a - b)
  console.log(`  ${path.padEnd(58)} p50 ${percentile(ms, 50).toFixed(1)} ms  p95 ${percentile(ms, 95).toFixed(1)} ms  (goal p95 < 50 ms)`)
}

export async function benchProgress(): Promise<void> {
  const student = await benchStudent()
  const client = await new Client().signIn(student.email, 'bench-password-1')
  console.log(`progress and habits routes, ${RUNS} sequential requests each after ${WARM_UP} to warm up:`)
  await time(client, `/api/me/progress?drill=${student.busiest}`)
  await time(client, `/api/me/progress?drill=${student.busiest}&range=3m`)
  await time(client, '/api/me/progress')
  await time(client, `/api/students/${student.id}/progress?drill=${student.busiest}`)
  await time(client, `/api/students/${student.id}/habits?range=all`)
  await time(client, `/api/students/${student.id}/habits`)
  await closeTestDb()
}

if (import.meta.url === `file://${process.argv[1]}`) await benchProgress()
