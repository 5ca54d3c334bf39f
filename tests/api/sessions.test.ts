// Sessions end on the server: a cookie kept after sign-out, a password change, "sign out everywhere" or an
// admin's decision no longer reads anything, and sessions lapse when idle or old.
import { afterAll, describe, expect, it } from 'vitest'
import { Client, closeTestDb, testDb } from '../support/server'
import { makeAccount, TEST_PASSWORD } from '../support/accounts'
import { linkIn, waitForMail } from '../support/mail'

afterAll(closeTestDb)

/** A second browser holding a copy of `client`'s cookie, as a thief replaying it would. */
function replay(client: Client): (path: string) => Promise<number> {
  const cookie = client.cookieHeader
  return async path => (await new Client().request('GET', path, undefined, undefined, { cookie })).status
}

async function sessionRows(userId: number): Promise<number> {
  return (await testDb()('sessions').where({ user_id: userId })).length
}

describe('server-side sessions', () => {
  it('refuses a cookie replayed after sign-out', async () => {
    const student = await new Client().signIn('student@evenhand.test')
    const stolen = replay(student)
    expect(await stolen('/api/drills')).toBe(200)
    expect((await student.post('/api/auth/logout')).status).toBe(200)
    expect(await stolen('/api/drills')).toBe(401)
    expect(await stolen('/api/attempts')).toBe(401)
  })

  it('shows a replayed signed-out cookie as signed out on the session endpoint too', async () => {
    const student = await new Client().signIn('student@evenhand.test')
    const cookie = student.cookieHeader
    await student.post('/api/auth/logout')
    const res = await new Client().request('GET', '/api/_auth/session', undefined, undefined, { cookie })
    expect(res.body).not.toHaveProperty('user')
  })

  it('gives the cookie an expiry and keeps the session id out of the browser\'s view', async () => {
    const teacher = await makeAccount('teacher')
    const res = await new Client().request('POST', '/api/auth/login', { email: teacher.email, password: 'tidy-octave-climb-7' })
    const expires = Date.parse(/Expires=([^;]+)/i.exec(res.headers.get('set-cookie') ?? '')?.[1] ?? '')
    // Sixty days, the absolute lifetime of a session.
    expect(Math.abs(expires - (Date.now() + 60 * 24 * 3600_000))).toBeLessThan(120_000)
    const session = await teacher.client.get('/api/_auth/session')
    expect(JSON.stringify(session.body)).not.toMatch(/sid|secure/)
  })

  it('ends every session of the account with sign out everywhere', async () => {
    const account = await makeAccount('teacher')
    const laptop = account.client
    const phone = await new Client().signIn(account.email, 'tidy-octave-climb-7')
    expect(await sessionRows(account.id)).toBe(2)
    const res = await phone.post('/api/auth/logout-everywhere')
    expect(res.status).toBe(200)
    expect(res.body).toEqual({ ended: 2 })
    expect((await laptop.get('/api/classes')).status).toBe(401)
    expect((await phone.get('/api/classes')).status).toBe(401)
    expect(await sessionRows(account.id)).toBe(0)
  })

  it('ends the other sessions when the password is changed through a reset link', async () => {
    const account = await makeAccount('teacher')
    const other = replay(account.client)
    await new Client().post('/api/auth/forgot', { email: account.email })
    const token = linkIn((await waitForMail(account.email, 1))[0]!, '/reset-password').searchParams.get('token')
    const browser = new Client()
    expect((await browser.post('/api/auth/reset', { token, password: 'fresh-cadence-4' })).status).toBe(200)
    expect(await other('/api/classes')).toBe(401)
    expect((await browser.get('/api/classes')).status).toBe(200)
  })

  it('ends the other sessions when the password is changed in settings, and keeps this browser signed in', async () => {
    const account = await makeAccount('teacher')
    const other = replay(account.client)
    expect(await other('/api/classes')).toBe(200)
    const common = await account.client.post('/api/account/password', { currentPassword: TEST_PASSWORD, password: 'password123' })
    expect(common.status).toBe(400)
    expect(await other('/api/classes')).toBe(200)
    expect((await account.client.post('/api/account/password', { currentPassword: TEST_PASSWORD, password: 'quiet-arpeggio-7' })).status).toBe(200)
    expect(await other('/api/classes')).toBe(401)
    expect((await account.client.get('/api/classes')).status).toBe(200)
    expect(await sessionRows(account.id)).toBe(1)
  })

  it('lets an admin end a user\'s sessions, and no one else', async () => {
    const admin = await makeAccount('admin')
    const target = await makeAccount('teacher')
    const stranger = await makeAccount('teacher')
    expect((await stranger.client.request('DELETE', `/api/admin/users/${target.id}/sessions`)).status).toBe(403)
    expect((await target.client.get('/api/classes')).status).toBe(200)
    const res = await admin.client.request('DELETE', `/api/admin/users/${target.id}/sessions`)
    expect(res.status).toBe(200)
    expect(res.body).toEqual({ ended: 1 })
    expect((await target.client.get('/api/classes')).status).toBe(401)
    expect((await admin.client.request('DELETE', '/api/admin/users/999999999/sessions')).status).toBe(404)
  })

  it('signs out a session idle for longer than two weeks', async () => {
    const account = await makeAccount('teacher')
    await testDb()('sessions').where({ user_id: account.id }).update({ last_seen_at: new Date(Date.now() - 15 * 24 * 3600_000) })
    expect((await account.client.get('/api/classes')).status).toBe(401)
    expect(await sessionRows(account.id)).toBe(0)
  })

  it('keeps a session used within two weeks, and brings its last use up to date', async () => {
    const account = await makeAccount('teacher')
    const tenDaysAgo = new Date(Date.now() - 10 * 24 * 3600_000)
    await testDb()('sessions').where({ user_id: account.id }).update({ last_seen_at: tenDaysAgo })
    expect((await account.client.get('/api/classes')).status).toBe(200)
    const row = await testDb()('sessions').where({ user_id: account.id }).first()
    expect(new Date(row.last_seen_at).getTime()).toBeGreaterThan(Date.now() - 60_000)
  })

  it('signs out a session past its absolute lifetime however recently it was used', async () => {
    const account = await makeAccount('teacher')
    await testDb()('sessions').where({ user_id: account.id }).update({ expires_at: new Date(Date.now() - 1000) })
    expect((await account.client.get('/api/classes')).status).toBe(401)
  })
})
