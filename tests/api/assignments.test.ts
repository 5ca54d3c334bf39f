import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { Client, closeTestDb, testDb } from '../support/server'
import { newClass, newStudent, newTeacher, publicDrillIds } from '../support/studio'
import { storedResult } from '../support/attempts'

afterAll(closeTestDb)

interface Item { drillId: number, targetScore: number | null, attempts: number, bestScore: number | null, latestScore: number | null, bestTempoBpm: number | null, reachedTarget: boolean }
interface Assignment { id: number, drillSetId: number, dueAt: string, dueOn: string, timeZone: string, note: string | null, target: { kind: string, id: number }, items: Item[] }

/** A calendar date `days` from today as seen in `zone` (computed here with Intl, independently of the app's helper). */
function dayIn(zone: string, days: number): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone: zone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date(Date.now() + days * 86_400_000))
}

let teacher: Client
let cls: { id: number, joinCode: string }
let setId: number
let drills: number[]

beforeAll(async () => {
  teacher = await newTeacher('Assigning Teacher')
  cls = await newClass(teacher)
  drills = await publicDrillIds()
  setId = Number((await teacher.post('/api/drill-sets', { title: 'Homework', items: [{ drillId: drills[0], targetBpm: 80, targetScore: 70 }, { drillId: drills[1] }] })).body.id)
})

describe('assignments', () => {
  it('assigns a set to a class, due at the end of the chosen day in the teacher\'s time zone', async () => {
    const student = await newStudent(cls.joinCode)
    const dueOn = dayIn('Pacific/Auckland', 3)
    const res = await teacher.post('/api/assignments', { drillSetId: setId, classId: cls.id, dueOn, timeZone: 'Pacific/Auckland', note: 'Slowly.' })
    expect(res.status).toBe(201)
    const row = await testDb()('assignments').where({ id: res.body.id }).first()
    // Auckland is 12 or 13 hours ahead of UTC, so the day ends at 10:59:59.999 or 11:59:59.999 UTC on that date.
    const end = new Date(row.due_at).toISOString()
    expect([`${dueOn}T10:59:59.999Z`, `${dueOn}T11:59:59.999Z`]).toContain(end)
    expect(row.time_zone).toBe('Pacific/Auckland')
    const mine = await student.client.get<{ assignments: Assignment[] }>('/api/me/assignments')
    expect(mine.status).toBe(200)
    expect(mine.body.assignments).toMatchObject([{ id: res.body.id, dueOn, timeZone: 'Pacific/Auckland', note: 'Slowly.', items: [{ drillId: drills[0] }, { drillId: drills[1] }] }])
  })

  it('accepts today in the teacher\'s zone but answers 400 for yesterday', async () => {
    for (const zone of ['Pacific/Kiritimati', 'Pacific/Pago_Pago']) {
      const today = await teacher.post('/api/assignments', { drillSetId: setId, classId: cls.id, dueOn: dayIn(zone, 0), timeZone: zone })
      expect(today.status).toBe(201)
      const past = await teacher.post('/api/assignments', { drillSetId: setId, classId: cls.id, dueOn: dayIn(zone, -1), timeZone: zone })
      expect(past.status).toBe(400)
      expect(past.body.message).toBe('dueOn: The due date is in the past')
    }
  })

  it.each([
    ['both a class and a student', { classId: 1, studentId: 1 }, 'classId'],
    ['neither', {}, 'classId'],
    ['a date that does not exist', { classId: 1, dueOn: '2031-02-30' }, 'dueOn'],
    ['a date past what MariaDB stores', { classId: 1, dueOn: '2040-01-01' }, 'dueOn'],
    ['an unknown time zone', { classId: 1, timeZone: 'Mars/Olympus' }, 'timeZone'],
    ['an over-long note', { classId: 1, note: 'x'.repeat(2001) }, 'note'],
  ])('answers 400 naming the field for %s', async (_, extra, field) => {
    const res = await teacher.post('/api/assignments', { drillSetId: setId, dueOn: dayIn('UTC', 2), ...extra })
    expect(res.status).toBe(400)
    expect(String(res.body.message)).toMatch(new RegExp(`^${field}:`))
  })

  it('assigns to one student of the teacher\'s class; the student sees it with best and latest score against the targets', async () => {
    const db = testDb()
    const student = await newStudent(cls.joinCode)
    const classmate = await newStudent(cls.joinCode)
    const res = await teacher.post('/api/assignments', { drillSetId: setId, studentId: student.id, dueOn: dayIn('UTC', 5) })
    expect(res.status).toBe(201)
    const drill = await db('drills').where({ id: drills[0] }).first('version')
    const attempt = (score: number, tempo: number, at: string) => ({ id: crypto.randomUUID(), student_id: student.id, drill_id: drills[0], drill_version: drill.version, assignment_id: res.body.id, started_at: new Date(at), tempo_bpm: tempo, input_device: 'screen', events: '[]', score, result: storedResult(), engine_version: 'test' })
    await db('attempts').insert([attempt(82, 72, '2026-11-30T10:00:00Z'), attempt(64, 80, '2026-12-01T10:00:00Z')])
    const mine = await student.client.get<{ assignments: Assignment[] }>('/api/me/assignments')
    const own = mine.body.assignments.find(a => a.id === res.body.id)!
    expect(own.target).toEqual({ kind: 'student', id: student.id, name: 'Test Student' })
    expect(own.items[0]).toMatchObject({ drillId: drills[0], targetScore: 70, attempts: 2, bestScore: 82, latestScore: 64, bestTempoBpm: 80, reachedTarget: true })
    expect(own.items[1]).toMatchObject({ drillId: drills[1], attempts: 0, bestScore: null, latestScore: null, reachedTarget: false })
    const theirs = await classmate.client.get<{ assignments: Assignment[] }>('/api/me/assignments')
    expect(theirs.body.assignments.map(a => a.id)).not.toContain(res.body.id)
    // The class's progress table now holds this student's own assignment, in their row only.
    const progress = await teacher.get<{ drills: { id: number, forSomeOnly: boolean }[], cells: Record<number, Record<number, { assigned: boolean, attempts: number }>> }>(`/api/classes/${cls.id}/progress`)
    expect(progress.body.cells[student.id]![drills[0]!]).toMatchObject({ assigned: true, attempts: 2 })
  })

  it('edits the due date and note, and withdraws an assignment while the attempts stay', async () => {
    const db = testDb()
    const student = await newStudent(cls.joinCode)
    const { body } = await teacher.post('/api/assignments', { drillSetId: setId, classId: cls.id, dueOn: dayIn('UTC', 1), timeZone: 'UTC' })
    const dueOn = dayIn('UTC', 9)
    const edited = await teacher.request<{ assignment: Assignment }>('PATCH', `/api/assignments/${body.id}`, { dueOn, note: 'More time.' })
    expect(edited.status).toBe(200)
    expect(edited.body.assignment).toMatchObject({ dueOn, note: 'More time.', dueAt: `${dueOn}T23:59:59.999Z` })
    expect((await teacher.request('PATCH', `/api/assignments/${body.id}`, { dueOn: dayIn('UTC', -2) })).status).toBe(400)
    const drill = await db('drills').where({ id: drills[1] }).first('version')
    const attemptId = crypto.randomUUID()
    await db('attempts').insert({ id: attemptId, student_id: student.id, drill_id: drills[1], drill_version: drill.version, assignment_id: body.id, started_at: new Date(), tempo_bpm: 60, input_device: 'screen', events: '[]', score: 40, result: storedResult(), engine_version: 'test' })
    expect((await teacher.request('DELETE', `/api/assignments/${body.id}`)).status).toBe(204)
    expect((await student.client.get<{ assignments: Assignment[] }>('/api/me/assignments')).body.assignments.map(a => a.id)).not.toContain(body.id)
    expect(await db('attempts').where({ id: attemptId }).first('student_id', 'assignment_id')).toEqual({ student_id: student.id, assignment_id: null })
    expect((await teacher.request('DELETE', `/api/assignments/${body.id}`)).status).toBe(404)
  })

  it('answers 409 for an archived set or class', async () => {
    const archivedSet = Number((await teacher.post('/api/drill-sets', { title: 'Old', items: [] })).body.id)
    await teacher.request('PATCH', `/api/drill-sets/${archivedSet}`, { archived: true })
    expect((await teacher.post('/api/assignments', { drillSetId: archivedSet, classId: cls.id, dueOn: dayIn('UTC', 2) })).status).toBe(409)
    const closed = await newClass(teacher, 'Closed')
    await teacher.request('PATCH', `/api/classes/${closed.id}`, { archived: true })
    expect((await teacher.post('/api/assignments', { drillSetId: setId, classId: closed.id, dueOn: dayIn('UTC', 2) })).status).toBe(409)
  })

  it('keeps each teacher to their own sets, classes, students and assignments', async () => {
    const other = await newTeacher('Other')
    const otherClass = await newClass(other)
    const otherSet = Number((await other.post('/api/drill-sets', { title: 'Theirs', items: [] })).body.id)
    const stranger = await newStudent(otherClass.joinCode)
    const due = dayIn('UTC', 2)
    expect((await teacher.post('/api/assignments', { drillSetId: otherSet, classId: cls.id, dueOn: due })).status).toBe(404)
    expect((await teacher.post('/api/assignments', { drillSetId: setId, classId: otherClass.id, dueOn: due })).status).toBe(404)
    expect((await teacher.post('/api/assignments', { drillSetId: setId, studentId: stranger.id, dueOn: due })).status).toBe(404)
    const { body } = await teacher.post('/api/assignments', { drillSetId: setId, classId: cls.id, dueOn: due })
    expect((await other.request('PATCH', `/api/assignments/${body.id}`, { note: 'mine' })).status).toBe(404)
    expect((await other.request('DELETE', `/api/assignments/${body.id}`)).status).toBe(404)
    expect(await testDb()('assignments').where({ id: body.id }).first('note')).toEqual({ note: null })
    const list = await other.get<{ assignments: Assignment[] }>('/api/assignments')
    expect(list.body.assignments.map(a => a.id)).not.toContain(body.id)
    expect((await stranger.client.get<{ assignments: Assignment[] }>('/api/me/assignments')).body.assignments).toEqual([])
    expect((await stranger.client.post('/api/assignments', { drillSetId: setId, classId: cls.id, dueOn: due })).status).toBe(403)
    expect((await teacher.get('/api/me/assignments')).status).toBe(403)
    expect((await new Client().get('/api/me/assignments')).status).toBe(401)
  })
})
