import { afterAll, describe, expect, it } from 'vitest'
import { Client, closeTestDb, testDb } from '../support/server'
import { newClass, newStudent, newTeacher, publicDrillIds, uniqueEmail } from '../support/studio'
import { JOIN_CODE_ALPHABET } from '../../shared/types/classes'
import { storedResult } from '../support/attempts'

afterAll(closeTestDb)

interface Detail { id: number, name: string, joinCode: string, archived: boolean, students: { id: number, name: string, lastPracticeAt: string | null }[] }

describe('classes', () => {
  it('creates a class with a join code of unambiguous characters, renames and archives it', async () => {
    const teacher = await newTeacher()
    const res = await teacher.post<{ id: number, joinCode: string }>('/api/classes', { name: 'Monday group' })
    expect(res.status).toBe(201)
    expect(res.body.joinCode).toMatch(new RegExp(`^[${JOIN_CODE_ALPHABET}]{8}$`))
    const row = await testDb()('classes').where({ id: res.body.id }).first()
    expect(row.join_code).toBe(res.body.joinCode)
    const renamed = await teacher.request<{ class: Detail }>('PATCH', `/api/classes/${res.body.id}`, { name: 'Monday starters' })
    expect(renamed.body.class.name).toBe('Monday starters')
    await teacher.request('PATCH', `/api/classes/${res.body.id}`, { archived: true })
    const list = await teacher.get<{ classes: { id: number, archived: boolean }[] }>('/api/classes')
    expect(list.body.classes.find(c => c.id === res.body.id)?.archived).toBe(true)
  })

  it('regenerates the code: the old one stops working, the new one lets a student in', async () => {
    const teacher = await newTeacher()
    const cls = await newClass(teacher)
    const regen = await teacher.post<{ joinCode: string }>(`/api/classes/${cls.id}/join-code`)
    expect(regen.status).toBe(200)
    expect(regen.body.joinCode).not.toBe(cls.joinCode)
    const refused = await new Client().post('/api/auth/register', { role: 'student', joinCode: cls.joinCode, name: 'Late', email: uniqueEmail('late'), password: 'long-enough-1' })
    expect(refused.status).toBe(404)
    expect(refused.body.message).toMatch(/^code: No class has this code/)
    const student = await newStudent(regen.body.joinCode.toLowerCase())
    const detail = await teacher.get<{ class: Detail }>(`/api/classes/${cls.id}`)
    expect(detail.body.class.students.map(s => s.id)).toEqual([student.id])
  })

  it('signs a student up with a class code as a student, and still signs teachers up without one', async () => {
    const teacher = await newTeacher()
    const cls = await newClass(teacher)
    const student = await newStudent(cls.joinCode, 'Mira Olsen')
    const row = await testDb()('users').where({ id: student.id }).first('role', 'name')
    expect(row).toEqual({ role: 'student', name: 'Mira Olsen' })
    expect((await student.client.get('/api/drill-sets')).status).toBe(403)
    const classes = await student.client.get<{ classes: { id: number }[] }>('/api/classes')
    expect(classes.body.classes.map(c => c.id)).toEqual([cls.id])
    const teacherRow = await testDb()('users').where({ email: (await teacher.get<{ user: { email: string } }>('/api/_auth/session')).body.user.email }).first('role')
    expect(teacherRow.role).toBe('teacher')
  })

  it.each([
    ['a student without a code', { role: 'student', name: 'N', password: 'long-enough-1' }, 'joinCode'],
    ['a code with punctuation', { role: 'student', joinCode: 'AB-CD', name: 'N', password: 'long-enough-1' }, 'joinCode'],
    ['an unknown role', { role: 'admin', name: 'N', password: 'long-enough-1' }, 'role'],
  ])('refuses sign-up with 400 for %s', async (_, body, field) => {
    const res = await new Client().post('/api/auth/register', { ...body, email: uniqueEmail('x') })
    expect(res.status).toBe(400)
    expect(String(res.body.message)).toMatch(new RegExp(`^${field}:`))
  })

  it('lets a signed-in student join by code, once, and refuses unknown and archived codes', async () => {
    const teacher = await newTeacher()
    const first = await newClass(teacher, 'First')
    const second = await newClass(teacher, 'Second')
    const student = await newStudent(first.joinCode)
    const joined = await student.client.post('/api/classes/join', { code: ` ${second.joinCode.toLowerCase()} ` })
    expect(joined.status).toBe(200)
    expect(joined.body).toEqual({ class: { id: second.id, name: 'Second' } })
    expect((await student.client.post('/api/classes/join', { code: second.joinCode })).status).toBe(200)
    expect(await testDb()('class_members').where({ student_id: student.id }).orderBy('class_id').pluck('class_id')).toEqual([first.id, second.id])
    expect((await student.client.post('/api/classes/join', { code: 'ZZZZZZZZ' })).status).toBe(404)
    expect((await student.client.post('/api/classes/join', {})).status).toBe(400)
    await teacher.request('PATCH', `/api/classes/${second.id}`, { archived: true })
    const third = await newClass(teacher, 'Third')
    await teacher.request('PATCH', `/api/classes/${third.id}`, { archived: true })
    expect((await student.client.post('/api/classes/join', { code: third.joinCode })).status).toBe(404)
    expect((await teacher.post('/api/classes/join', { code: first.joinCode })).status).toBe(403)
    expect((await new Client().post('/api/classes/join', { code: first.joinCode })).status).toBe(401)
  })

  it('shows the roster with each student\'s last practice and removes a student without touching their attempts', async () => {
    const db = testDb()
    const teacher = await newTeacher()
    const cls = await newClass(teacher)
    const student = await newStudent(cls.joinCode)
    const [drillId] = await publicDrillIds()
    const drill = await db('drills').where({ id: drillId }).first('version')
    const startedAt = new Date('2026-11-20T17:00:00.000Z')
    const attemptId = crypto.randomUUID()
    await db('attempts').insert({ id: attemptId, student_id: student.id, drill_id: drillId, drill_version: drill.version, started_at: startedAt, tempo_bpm: 60, input_device: 'screen', events: '[]', score: 50, result: storedResult(), engine_version: 'test' })
    const detail = await teacher.get<{ class: Detail }>(`/api/classes/${cls.id}`)
    expect(detail.body.class.students).toMatchObject([{ id: student.id, lastPracticeAt: startedAt.toISOString() }])
    const removed = await teacher.request('DELETE', `/api/classes/${cls.id}/students/${student.id}`)
    expect(removed.status).toBe(204)
    expect((await teacher.get<{ class: Detail }>(`/api/classes/${cls.id}`)).body.class.students).toEqual([])
    expect(await db('attempts').where({ id: attemptId }).first('student_id')).toEqual({ student_id: student.id })
    expect((await teacher.request('DELETE', `/api/classes/${cls.id}/students/${student.id}`)).status).toBe(404)
  })

  it('keeps each teacher\'s classes to themselves', async () => {
    const teacher = await newTeacher()
    const cls = await newClass(teacher)
    const student = await newStudent(cls.joinCode)
    const other = await newTeacher('Other')
    expect((await other.get(`/api/classes/${cls.id}`)).status).toBe(404)
    expect((await other.request('PATCH', `/api/classes/${cls.id}`, { name: 'Mine now' })).status).toBe(404)
    expect((await other.post(`/api/classes/${cls.id}/join-code`)).status).toBe(404)
    expect((await other.request('DELETE', `/api/classes/${cls.id}/students/${student.id}`)).status).toBe(404)
    expect((await testDb()('class_members').where({ class_id: cls.id }).pluck('student_id'))).toEqual([student.id])
    const row = await testDb()('classes').where({ id: cls.id }).first('name', 'join_code')
    expect(row).toEqual({ name: 'Test Class', join_code: cls.joinCode })
    expect((await student.client.get(`/api/classes/${cls.id}`)).status).toBe(403)
    expect((await student.client.post('/api/classes', { name: 'S' })).status).toBe(403)
    expect((await new Client().post('/api/classes', { name: 'S' })).status).toBe(401)
    expect((await teacher.post('/api/classes', { name: '' })).status).toBe(400)
    expect((await teacher.post('/api/classes', { name: 'x'.repeat(121) })).status).toBe(400)
    expect((await teacher.get('/api/classes/abc')).status).toBe(400)
  })

  it('shows a student only their own classes', async () => {
    const teacher = await newTeacher()
    const mine = await newClass(teacher, 'Mine')
    await newClass(teacher, 'Not mine')
    const student = await newStudent(mine.joinCode)
    const list = await student.client.get<{ classes: { id: number, joinCode: string | null, students: unknown[] }[] }>('/api/classes')
    expect(list.body.classes).toMatchObject([{ id: mine.id, joinCode: null, students: [] }])
  })
})
