import { afterAll, describe, expect, it } from 'vitest'
import { Client, closeTestDb, testDb } from '../support/server'

afterAll(closeTestDb)

async function attemptOf(email: string): Promise<string> {
  const db = testDb()
  const row = await db('attempts as a').join('users as u', 'u.id', 'a.student_id').where('u.email', email).first('a.id')
  return String(row.id)
}

describe('comments on an attempt', () => {
  it('lets the student\'s teacher comment and shows the comment on the attempt', async () => {
    const id = await attemptOf('theo@evenhand.test')
    const teacher = await new Client().signIn('teacher@evenhand.test')
    const body = `Keep the wrist level through the thumb-under ${Date.now()}`
    const res = await teacher.post<{ comment: { id: number, body: string, teacherName: string } }>(`/api/attempts/${id}/comments`, { body: `  ${body}  ` })
    expect(res.status).toBe(201)
    expect(res.body.comment.body).toBe(body)
    expect(res.body.comment.teacherName).toBe('Wren Halloway')
    const stored = await testDb()('comments').where({ id: res.body.comment.id }).first()
    expect(stored.body).toBe(body)
    expect(stored.attempt_id).toBe(id)
    const student = await new Client().signIn('theo@evenhand.test')
    const page = await student.get<{ attempt: { comments?: { body: string }[] } }>(`/api/attempts/${id}`)
    expect(JSON.stringify(page.body)).toContain(body)
  })

  it('refuses an empty or over-long comment with the field named, storing nothing', async () => {
    const id = await attemptOf('theo@evenhand.test')
    const teacher = await new Client().signIn('teacher@evenhand.test')
    const before = (await testDb()('comments').count({ n: '*' }))[0]!.n
    const empty = await teacher.post(`/api/attempts/${id}/comments`, { body: '   ' })
    expect(empty.status).toBe(400)
    expect(String(empty.body.message)).toMatch(/^body: Write a comment first/)
    const long = await teacher.post(`/api/attempts/${id}/comments`, { body: 'x'.repeat(4001) })
    expect(long.status).toBe(400)
    expect((await testDb()('comments').count({ n: '*' }))[0]!.n).toBe(before)
  })

  it('keeps other teachers and students out', async () => {
    const id = await attemptOf('theo@evenhand.test')
    const other = new Client()
    await other.post('/api/auth/register', { name: 'Other Teacher', email: `other-c-${Date.now()}@evenhand.test`, password: 'long-enough-1' })
    expect((await other.post(`/api/attempts/${id}/comments`, { body: 'Nice' })).status).toBe(404)
    const student = await new Client().signIn('theo@evenhand.test')
    expect((await student.post(`/api/attempts/${id}/comments`, { body: 'Nice' })).status).toBe(403)
    expect((await new Client().post(`/api/attempts/${id}/comments`, { body: 'Nice' })).status).toBe(401)
    const teacher = await new Client().signIn('teacher@evenhand.test')
    expect((await teacher.post('/api/attempts/00000000-0000-4000-8000-000000000000/comments', { body: 'Nice' })).status).toBe(404)
  })
})
