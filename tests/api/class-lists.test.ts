// The two lists every home page reads: the classes a user belongs to or teaches, and the assignments.
import { afterAll, describe, expect, it } from 'vitest'
import { Client, closeTestDb, testDb } from '../support/server'

afterAll(closeTestDb)

interface ClassList { classes: { id: number, name: string, joinCode: string | null, students: { id: number, name: string }[] }[] }
interface AssignmentList {
  assignments: {
    id: number
    target: { kind: 'class' | 'student', name: string }
    overdue: boolean
    dueAt: string | null
    items: { drillId: number, attempts?: number, bestScore?: number | null }[]
  }[]
}

describe('GET /api/classes', () => {
  it('gives the teacher their classes with join codes and rosters from the database', async () => {
    const teacher = await new Client().signIn('teacher@evenhand.test')
    const res = await teacher.get<ClassList>('/api/classes')
    expect(res.status).toBe(200)
    const db = testDb()
    const owned = await db('classes as c').join('users as t', 't.id', 'c.teacher_id').where('t.email', 'teacher@evenhand.test').select('c.id', 'c.join_code')
    expect(res.body.classes.map(c => c.id).sort()).toEqual(owned.map(c => Number(c.id)).sort())
    for (const c of res.body.classes) {
      expect(c.joinCode).toBe(owned.find(o => Number(o.id) === c.id)!.join_code)
      const members = await db('class_members').where({ class_id: c.id }).pluck('student_id')
      expect(c.students.map(s => s.id).sort()).toEqual(members.map(Number).sort())
    }
  })

  it('gives a student only their own classes, without the code or the roster', async () => {
    const student = await new Client().signIn('theo@evenhand.test')
    const res = await student.get<ClassList>('/api/classes')
    expect(res.status).toBe(200)
    expect(res.body.classes.map(c => c.name)).toEqual(['Tuesday Starters'])
    expect(res.body.classes[0]!.joinCode).toBeNull()
    expect(res.body.classes[0]!.students).toEqual([])
  })

  it('gives a new teacher none of the demo studio\'s classes', async () => {
    const other = new Client()
    await other.post('/api/auth/register', { name: 'Other Teacher', email: `other-l-${Date.now()}@evenhand.test`, password: 'long-enough-1' })
    const res = await other.get<ClassList>('/api/classes')
    expect(res.status).toBe(200)
    expect(res.body.classes).toEqual([])
  })
})

describe('GET /api/assignments', () => {
  it('gives a student their class\'s assignments and their own, with their attempt counts', async () => {
    const noor = await new Client().signIn('student@evenhand.test')
    const res = await noor.get<AssignmentList>('/api/assignments')
    expect(res.status).toBe(200)
    const kinds = res.body.assignments.map(a => a.target.kind)
    expect(kinds).toContain('student')
    expect(kinds).toContain('class')
    const db = testDb()
    const noorId = Number((await db('users').where({ email: 'student@evenhand.test' }).first('id')).id)
    for (const a of res.body.assignments) {
      for (const item of a.items) {
        const n = Number((await db('attempts').where({ student_id: noorId, drill_id: item.drillId, assignment_id: a.id }).count({ n: '*' }))[0]!.n)
        expect(item.attempts).toBe(n)
      }
      const due = await db('assignments').where({ id: a.id }).first('due_at')
      expect(a.overdue).toBe(due.due_at !== null && new Date(due.due_at).getTime() < Date.now())
    }
  })

  it('keeps one student\'s own assignment from another student of the same class', async () => {
    const theo = await new Client().signIn('theo@evenhand.test')
    const res = await theo.get<AssignmentList>('/api/assignments')
    expect(res.status).toBe(200)
    expect(res.body.assignments.every(a => a.target.kind === 'class' && a.target.name === 'Tuesday Starters')).toBe(true)
    expect(res.body.assignments.length).toBeGreaterThan(0)
  })

  it('gives the teacher the assignments they made, and a new teacher none', async () => {
    const teacher = await new Client().signIn('teacher@evenhand.test')
    const res = await teacher.get<AssignmentList>('/api/assignments')
    expect(res.status).toBe(200)
    const made = Number((await testDb()('assignments as a').join('users as t', 't.id', 'a.assigned_by').where('t.email', 'teacher@evenhand.test').count({ n: '*' }))[0]!.n)
    expect(res.body.assignments).toHaveLength(made)
    const other = new Client()
    await other.post('/api/auth/register', { name: 'Other Teacher', email: `other-a-${Date.now()}@evenhand.test`, password: 'long-enough-1' })
    expect((await other.get<AssignmentList>('/api/assignments')).body.assignments).toEqual([])
  })
})
