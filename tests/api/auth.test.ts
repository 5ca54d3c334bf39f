import { afterAll, describe, expect, it } from 'vitest'
import { Client, closeTestDb, testDb } from '../support/server'

afterAll(closeTestDb)

describe('health', () => {
  it('answers db ok when MariaDB answers a query', async () => {
    const res = await new Client().get('/api/health')
    expect(res.status).toBe(200)
    expect(res.body).toEqual({ db: 'ok' })
  })
})

describe('sign-in', () => {
  it('signs in a demo teacher with a sealed session cookie', async () => {
    const c = new Client()
    const res = await c.request('POST', '/api/auth/login', { email: 'teacher@evenhand.test', password: 'evenhand-demo' })
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({ user: { email: 'teacher@evenhand.test', role: 'teacher' } })
    expect(res.headers.get('set-cookie')).toMatch(/HttpOnly/i)
    expect((await c.get('/api/drills')).status).toBe(200)
  })

  it('gives one message for a wrong password and for an unknown e-mail', async () => {
    const wrongPassword = await new Client().post('/api/auth/login', { email: 'teacher@evenhand.test', password: 'not-the-password' })
    const unknownEmail = await new Client().post('/api/auth/login', { email: 'nobody@evenhand.test', password: 'evenhand-demo' })
    expect(wrongPassword.status).toBe(401)
    expect(unknownEmail.status).toBe(401)
    expect(wrongPassword.body.message).toBe('Wrong e-mail or password')
    expect(unknownEmail.body.message).toBe(wrongPassword.body.message)
  })

  it.each([
    ['malformed JSON', undefined, '{"email": '],
    ['a missing password', { email: 'teacher@evenhand.test' }, undefined],
    ['an e-mail that is not one', { email: 'teacher-at-evenhand', password: 'x' }, undefined],
    ['an over-long password', { email: 'teacher@evenhand.test', password: 'x'.repeat(201) }, undefined],
  ])('answers 400 naming the field for %s', async (_, body, raw) => {
    const res = await new Client().request('POST', '/api/auth/login', body, raw)
    expect(res.status).toBe(400)
    expect(String(res.body.message)).toMatch(/^(body|email|password):/)
  })

  it('signs out', async () => {
    const c = await new Client().signIn('student@evenhand.test')
    expect((await c.post('/api/auth/logout')).status).toBe(200)
    expect((await c.get('/api/drills')).status).toBe(401)
  })
})

describe('teacher sign-up', () => {
  it('makes a teacher and refuses the same e-mail twice with 409', async () => {
    const email = `new-teacher-${Date.now()}@evenhand.test`
    const first = await new Client().post('/api/auth/register', { name: 'Ines Varga', email, password: 'long-enough-1' })
    expect(first.status).toBe(201)
    expect(first.body).toMatchObject({ user: { email, role: 'teacher' } })
    const again = await new Client().post('/api/auth/register', { name: 'Ines Again', email: email.toUpperCase(), password: 'long-enough-2' })
    expect(again.status).toBe(409)
    expect(await testDb()('users').where({ email }).count({ n: '*' })).toEqual([{ n: 1 }])
  })

  it('writes nothing for a bad request', async () => {
    const email = `half-${Date.now()}@evenhand.test`
    const res = await new Client().post('/api/auth/register', { name: '', email, password: 'short' })
    expect(res.status).toBe(400)
    expect(res.body.message).toMatch(/name:.*password:/)
    expect(await testDb()('users').where({ email }).first()).toBeUndefined()
  })
})

describe('the guard', () => {
  it.each(['/api/drills', '/api/attempts', '/api/assignments', '/api/classes', '/api/drills/1'])('answers 401 to anonymous on %s', async (path) => {
    expect((await new Client().get(path)).status).toBe(401)
  })

  it('answers 403 to a teacher saving an attempt, a route for students', async () => {
    const c = await new Client().signIn('teacher@evenhand.test')
    const res = await c.post('/api/attempts', {})
    expect(res.status).toBe(403)
  })
})
