import { afterAll, describe, expect, it } from 'vitest'
import { Client, closeTestDb, testDb } from '../support/server'

afterAll(closeTestDb)

interface Progress {
  students: { id: number, name: string }[]
  drills: { id: number, title: string, forSomeOnly: boolean }[]
  cells: Record<string, Record<string, { assigned: boolean, attempts: number, best: number | null, latest: number | null, trend: number | null, overdue: boolean }>>
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
    // The class's set (three drills) and the set Noor was given alone (three more), which only Noor's row holds.
    expect(res.body.drills.filter(d => !d.forSomeOnly)).toHaveLength(3)
    const own = res.body.drills.filter(d => d.forSomeOnly)
    expect(own.map(d => d.title)).toEqual(['F major scale, left hand', 'A minor arpeggio, left hand', 'Five-finger pattern in G, left hand'])
    const noor = res.body.students.find(s => s.name === 'Noor Castellan')!
    const ada = res.body.students.find(s => s.name === 'Ada Lindqvist')!
    expect(own.map(d => res.body.cells[noor.id]![d.id]!.assigned)).toEqual([true, true, true])
    expect(own.map(d => res.body.cells[ada.id]![d.id]!.assigned)).toEqual([false, false, false])
    const noorsOwn = await testDb()('attempts').where({ student_id: noor.id, drill_id: own[0]!.id })
    expect(res.body.cells[noor.id]![own[0]!.id]!.attempts).toBe(noorsOwn.length)
    expect(noorsOwn.length).toBeGreaterThan(0)
    const theo = res.body.students.find(s => s.name === 'Theo Marchetti')!
    const drill = res.body.drills[0]!
    const stored = await testDb()('attempts').where({ student_id: theo.id, drill_id: drill.id }).orderBy('started_at')
    const cell = res.body.cells[theo.id]![drill.id]!
    expect(cell.attempts).toBe(stored.length)
    expect(cell.best).toBe(Math.max(...stored.map(a => a.score)))
    expect(cell.latest).toBe(stored.at(-1).score)
  })

  it('gives each cell its trend (latest against the mean of up to four before) and marks it overdue past the due date below the target', async () => {
    const db = testDb()
    const cls = await db('classes').where({ name: 'Thursday Developing' }).first('id', 'teacher_id')
    // A set the class was given a month ago with a target nobody reached, so some cells are overdue.
    const practised = await db('attempts as a').join('class_members as m', 'm.student_id', 'a.student_id').where('m.class_id', cls.id).first('a.drill_id')
    const [setId] = await db('drill_sets').insert({ owner_id: cls.teacher_id, title: 'Overdue check' })
    try {
      await db('drill_set_items').insert({ drill_set_id: setId, drill_id: practised.drill_id, position: 0, target_score: 100 })
      await db('assignments').insert({ drill_set_id: setId, class_id: cls.id, assigned_by: cls.teacher_id, due_at: new Date(Date.now() - 30 * 86_400_000) })
      await checkTrendAndOverdue(Number(cls.id))
    }
    finally {
      await db('drill_sets').where({ id: setId }).delete()
    }
  })

  async function checkTrendAndOverdue(classId: number): Promise<void> {
    const db = testDb()
    const teacher = await new Client().signIn('teacher@evenhand.test')
    const res = await teacher.get<Progress>(`/api/classes/${classId}/progress`)
    expect(res.status).toBe(200)
    const items: { drill_id: number, target_score: number | null, due_at: Date, student_id: number | null }[] = await db('assignments as a')
      .join('drill_set_items as i', 'i.drill_set_id', 'a.drill_set_id')
      .where(q => q.where('a.class_id', classId).orWhereIn('a.student_id', res.body.students.map(s => s.id)))
      .select('i.drill_id', 'i.target_score', 'a.due_at', 'a.student_id')
    const trends: (number | null)[] = []
    const overdue: boolean[] = []
    for (const student of res.body.students) {
      for (const drill of res.body.drills) {
        const scores = (await db('attempts').where({ student_id: student.id, drill_id: drill.id }).orderBy('started_at').select('score')).map(r => Number(r.score))
        const before = scores.slice(-5, -1)
        const wantTrend = before.length ? scores.at(-1)! - before.reduce((a, b) => a + b, 0) / before.length : null
        // Any assignment that reaches this student with the drill (the class's or their own) can make it overdue.
        const reaching = items.filter(i => Number(i.drill_id) === drill.id && (i.student_id === null || Number(i.student_id) === student.id))
        const best = scores.length ? Math.max(...scores) : null
        const wantOverdue = reaching.some(item => new Date(item.due_at).getTime() < Date.now() && (best === null || best < (item.target_score ?? 0)))
        const cell = res.body.cells[student.id]![drill.id]!
        if (wantTrend === null) expect(cell.trend).toBeNull()
        else expect(cell.trend).toBeCloseTo(wantTrend, 6)
        expect(cell.overdue).toBe(wantOverdue)
        trends.push(cell.trend)
        overdue.push(cell.overdue)
      }
    }
    expect(overdue).toContain(true)
    expect(overdue).toContain(false)
    expect(trends.some(t => t !== null && t !== 0)).toBe(true)
  }

  it('exports the same table as CSV, one row per student and drill', async () => {
    const id = await tuesdayId()
    const teacher = await new Client().signIn('teacher@evenhand.test')
    const res = await teacher.request('GET', `/api/classes/${id}/progress.csv`)
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toMatch(/text\/csv/)
    const lines = String(res.body).trimEnd().split('\r\n')
    expect(lines[0]).toBe('class,student,drill,attempts,best,latest,trend,overdue')
    // Three students × the class's three drills, and Noor's rows for the three drills given to her alone.
    expect(lines).toHaveLength(1 + 3 * 3 + 3)
    expect(lines.filter(l => l.includes('"F major scale, left hand"')).map(l => l.split(',')[1])).toEqual(['Noor Castellan'])
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
