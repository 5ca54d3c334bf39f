import { afterAll, describe, expect, it } from 'vitest'
import { Client, closeTestDb, testDb } from '../support/server'

afterAll(closeTestDb)

interface Progress {
  students: { id: number, name: string }[]
  drills: { id: number, title: string }[]
  cells: Record<string, Record<string, { attempts: number, best: number | null, latest: number | null, overdue: boolean }>>
}

async function tuesdayId(): Promise<number> {
  return Number((await testDb()('classes').where({ name: 'Tuesday Starters' }).first('id')).id)
}

describe('class progress', () => {
  it('gives the teacher students × drills with best and latest scores matching the stored attempts', async () => {
    const id = await tuesdayId()
    const teacher = await new Client().signIn('teacher@evenhand.test')
    const res = await teacher.get<Progress>(`/api/classes/${id}/progress`)
    expect(res.status).toBe(200)
    expect(res.body.students.map(s => s.name)).toEqual(['Ada Lindqvist', 'Noor Castellan', 'Theo Marchetti'])
    expect(res.body.drills).toHaveLength(3)
    const theo = res.body.students.find(s => s.name === 'Theo Marchetti')!
    const drill = res.body.drills[0]!
    const stored = await testDb()('attempts').where({ student_id: theo.id, drill_id: drill.id }).orderBy('started_at')
    const cell = res.body.cells[theo.id]![drill.id]!
    expect(cell.attempts).toBe(stored.length)
    expect(cell.best).toBe(Math.max(...stored.map(a => a.score)))
    expect(cell.latest).toBe(stored.at(-1).score)
  })

  it('exports the same table as CSV, one row per student and drill', async () => {
    const id = await tuesdayId()
    const teacher = await new Client().signIn('teacher@evenhand.test')
    const res = await teacher.request('GET', `/api/classes/${id}/progress.csv`)
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toMatch(/text\/csv/)
    const lines = String(res.body).trimEnd().split('\r\n')
    expect(lines[0]).toBe('class,student,drill,attempts,best,latest,trend,overdue')
    expect(lines).toHaveLength(1 + 3 * 3)
    // A drill title with a comma is quoted, as RFC 4180 asks.
    expect(lines[1]).toMatch(/^Tuesday Starters,Ada Lindqvist,"[^"]+, right hand",\d+,/)
  })

  it('hides another teacher\'s class and refuses students', async () => {
    const id = await tuesdayId()
    const other = new Client()
    await other.post('/api/auth/register', { name: 'Other Teacher', email: `other-${Date.now()}@evenhand.test`, password: 'long-enough-1' })
    expect((await other.get(`/api/classes/${id}/progress`)).status).toBe(404)
    const student = await new Client().signIn('student@evenhand.test')
    expect((await student.get(`/api/classes/${id}/progress`)).status).toBe(403)
    expect((await student.get('/api/classes/abc/progress')).status).toBe(403)
  })
})
