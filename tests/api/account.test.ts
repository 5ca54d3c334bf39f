import { afterAll, describe, expect, it } from 'vitest'
import { Client, closeTestDb, testDb } from '../support/server'
import { linkIn, waitForMail } from '../support/mail'
import type { Account } from '../../shared/types/account'

afterAll(closeTestDb)

let counter = 0
async function newTeacher(domain = 'evenhand.test'): Promise<{ client: Client, email: string, password: string }> {
  const email = `account-${Date.now()}-${++counter}@${domain}`
  const password = 'first-password-1'
  const client = new Client()
  expect((await client.post('/api/auth/register', { name: 'Pia Lorne', email, password })).status).toBe(201)
  return { client, email, password }
}

describe('account settings', () => {
  it('reads the signed-in account and refuses anonymous callers with 401', async () => {
    const { client, email } = await newTeacher()
    const res = await client.get('/api/account')
    expect(res.status).toBe(200)
    expect(res.body.account).toMatchObject({ email, name: 'Pia Lorne', role: 'teacher', guardianEmail: null })
    expect((await new Client().get('/api/account')).status).toBe(401)
    expect((await new Client().request('PATCH', '/api/account', { name: 'X' })).status).toBe(401)
    expect((await new Client().post('/api/account/password', { currentPassword: 'a', password: 'long-enough-1' })).status).toBe(401)
  })

  it('changes the name, in the database and in the session', async () => {
    const { client, email } = await newTeacher()
    const res = await client.request('PATCH', '/api/account', { name: '  Pia Lorne-Abadi ' })
    expect(res.status).toBe(200)
    expect(await testDb()('users').where({ email }).first('name')).toEqual({ name: 'Pia Lorne-Abadi' })
    const session = await client.get<{ user: { name: string } }>('/api/_auth/session')
    expect(session.body.user.name).toBe('Pia Lorne-Abadi')
  })

  it.each([
    ['an empty name', { name: '   ' }, /^name:/],
    ['a name longer than the column', { name: 'n'.repeat(121) }, /^name:/],
    ['nothing to change', {}, /^body:/],
    ['a guardian on a teacher account', { guardianEmail: 'someone@example.org' }, /^guardianEmail:/],
  ])('answers 400 naming the field for %s', async (_, body, message) => {
    const { client } = await newTeacher()
    const res = await client.request('PATCH', '/api/account', body)
    expect(res.status).toBe(400)
    expect(String(res.body.message)).toMatch(message)
  })

  it('changes the password only with the current one', async () => {
    const { client, email, password } = await newTeacher()
    const wrong = await client.post('/api/account/password', { currentPassword: 'not-my-password', password: 'second-password-2' })
    expect(wrong.status).toBe(400)
    expect(wrong.body.message).toMatch(/^currentPassword:/)
    const weak = await client.post('/api/account/password', { currentPassword: password, password: 'short' })
    expect(weak.status).toBe(400)
    expect(weak.body.message).toMatch(/^password:/)
    expect((await new Client().post('/api/auth/login', { email, password })).status).toBe(200)

    expect((await client.post('/api/account/password', { currentPassword: password, password: 'second-password-2' })).status).toBe(200)
    expect((await new Client().post('/api/auth/login', { email, password })).status).toBe(401)
    expect((await new Client().post('/api/auth/login', { email, password: 'second-password-2' })).status).toBe(200)
  })

  it('changes the sign-in e-mail only once the link sent to the new address is followed', async () => {
    const { client, email, password } = await newTeacher()
    const newEmail = `moved-${Date.now()}@evenhand.test`
    const res = await client.post('/api/account/email', { email: newEmail, currentPassword: password })
    expect(res.status).toBe(202)
    // Nothing changes before the link is followed.
    expect(await testDb()('users').where({ email }).first('id')).toBeDefined()
    expect((await new Client().post('/api/auth/login', { email: newEmail, password })).status).toBe(401)
    const waiting = (await client.get<{ account: Account }>('/api/account')).body.account
    expect(waiting.email).toBe(email)
    expect(waiting.pendingEmail?.email).toBe(newEmail)
    // The link works for 24 hours.
    expect(Date.parse(waiting.pendingEmail!.expiresAt) - Date.now()).toBeGreaterThan(23 * 3_600_000)
    expect(Date.parse(waiting.pendingEmail!.expiresAt) - Date.now()).toBeLessThanOrEqual(24 * 3_600_000)

    const [mail] = await waitForMail(newEmail)
    expect(mail!.parsed.subject).toBe('Confirm your new e-mail address for Evenhand')
    const link = linkIn(mail!, '/confirm-email')
    expect((await fetch(link)).status).toBe(200)
    const confirm = await client.post('/api/auth/confirm-email', { token: link.searchParams.get('token') })
    expect(confirm.status).toBe(200)
    expect(confirm.body).toEqual({ email: newEmail })
    expect((await client.get<{ user: { email: string } }>('/api/_auth/session')).body.user.email).toBe(newEmail)
    expect((await new Client().post('/api/auth/login', { email: newEmail, password })).status).toBe(200)
    expect((await new Client().post('/api/auth/login', { email, password })).status).toBe(401)
    expect((await client.get<{ account: Account }>('/api/account')).body.account).toMatchObject({ email: newEmail, pendingEmail: null })

    const again = await new Client().post('/api/auth/confirm-email', { token: link.searchParams.get('token') })
    expect(again.status).toBe(410)
  })

  it('refuses an address another account uses (409), a wrong password (400) and an unknown link (404)', async () => {
    const { client, password } = await newTeacher()
    const taken = await client.post('/api/account/email', { email: 'teacher@evenhand.test', currentPassword: password })
    expect(taken.status).toBe(409)
    expect(taken.body.message).toMatch(/^email:/)
    const wrong = await client.post('/api/account/email', { email: `x-${Date.now()}@evenhand.test`, currentPassword: 'nope-nope-nope' })
    expect(wrong.status).toBe(400)
    expect(wrong.body.message).toMatch(/^currentPassword:/)
    const unknown = await new Client().post('/api/auth/confirm-email', { token: 'y'.repeat(43) })
    expect(unknown.status).toBe(404)
    expect(unknown.body.message).toMatch(/not valid/)
  })

  it('lets a student set and clear a guardian address, which starts a stopped summary again', async () => {
    const student = await new Client().signIn('samir@evenhand.test')
    const set = await student.request('PATCH', '/api/account', { guardianEmail: 'Okonkwo.Home@Example.org' })
    expect(set.status).toBe(200)
    expect(set.body.account).toMatchObject({ guardianEmail: 'okonkwo.home@example.org', guardianSummaryStopped: false })
    await testDb()('users').where({ email: 'samir@evenhand.test' }).update({ guardian_summary_stopped_at: new Date() })
    expect((await student.get('/api/account')).body.account).toMatchObject({ guardianSummaryStopped: true })
    const changed = await student.request('PATCH', '/api/account', { guardianEmail: 'okonkwo.family@example.org' })
    expect(changed.body.account).toMatchObject({ guardianEmail: 'okonkwo.family@example.org', guardianSummaryStopped: false })
    const cleared = await student.request('PATCH', '/api/account', { guardianEmail: '' })
    expect(cleared.body.account).toMatchObject({ guardianEmail: null })
    expect((await student.request('PATCH', '/api/account', { guardianEmail: 'not-an-address' })).status).toBe(400)
  })
})

describe('a teacher acting for a student', () => {
  it('sends the teacher\'s own student a reset link that names the teacher', async () => {
    const teacher = await new Client().signIn('teacher@evenhand.test')
    const student = await testDb()('users').where({ email: 'lucia@evenhand.test' }).first('id')
    const res = await teacher.post(`/api/students/${student.id}/reset-link`)
    expect(res.status).toBe(202)
    const mails = await waitForMail('lucia@evenhand.test')
    const mail = mails.at(-1)!
    expect(mail.parsed.text).toContain('Wren Halloway asked Evenhand to send you a link')
    const token = linkIn(mail, '/reset-password').searchParams.get('token')
    const reset = await new Client().post('/api/auth/reset', { token, password: 'lucia-new-password' })
    expect(reset.status).toBe(200)
    expect(reset.body).toMatchObject({ user: { email: 'lucia@evenhand.test', role: 'student' } })
  })

  it('sets a student\'s guardian address', async () => {
    const teacher = await new Client().signIn('teacher@evenhand.test')
    const student = await testDb()('users').where({ email: 'jonah@evenhand.test' }).first('id')
    const res = await teacher.request('PUT', `/api/students/${student.id}/guardian`, { guardianEmail: 'pell.home@example.org' })
    expect(res.status).toBe(200)
    expect(await testDb()('users').where({ id: student.id }).first('guardian_email')).toEqual({ guardian_email: 'pell.home@example.org' })
  })

  it('answers 404 for a student of another teacher, 403 for a student caller and 400 for a bad id', async () => {
    const { client: stranger } = await newTeacher()
    const student = await testDb()('users').where({ email: 'ada@evenhand.test' }).first('id')
    const before = await testDb()('mail_outbox').where({ to_email: 'ada@evenhand.test' }).count({ n: '*' })
    expect((await stranger.post(`/api/students/${student.id}/reset-link`)).status).toBe(404)
    expect((await stranger.request('PUT', `/api/students/${student.id}/guardian`, { guardianEmail: 'x@example.org' })).status).toBe(404)
    expect(await testDb()('mail_outbox').where({ to_email: 'ada@evenhand.test' }).count({ n: '*' })).toEqual(before)
    const pupil = await new Client().signIn('theo@evenhand.test')
    expect((await pupil.post(`/api/students/${student.id}/reset-link`)).status).toBe(403)
    const teacher = await new Client().signIn('teacher@evenhand.test')
    expect((await teacher.post('/api/students/abc/reset-link')).status).toBe(400)
    // A teacher id is no student: 404, not a link to the teacher.
    const teacherRow = await testDb()('users').where({ email: 'teacher@evenhand.test' }).first('id')
    expect((await teacher.post(`/api/students/${teacherRow.id}/reset-link`)).status).toBe(404)
  })
})

describe('/dev/mail', () => {
  it('lists the stored messages newest first for a demo account, and shows one with its text and HTML', async () => {
    const { client: other, email } = await newTeacher('example.org')
    expect((await other.get('/api/dev/mail')).status).toBe(403)
    await new Client().post('/api/auth/forgot', { email })
    await waitForMail(email)
    const demo = await new Client().signIn('teacher@evenhand.test')
    const list = await demo.get<{ messages: { id: string, to: string, date: string }[] }>('/api/dev/mail')
    expect(list.status).toBe(200)
    // Newest received first: a message's Date is when it was written, and one queued earlier may arrive later.
    const ids = list.body.messages.map(m => m.id)
    expect(ids).toEqual([...ids].sort().reverse())
    const mine = list.body.messages.find(m => m.to.includes(email))!
    const one = await demo.get<{ message: { text: string, html: string, subject: string } }>(`/api/dev/mail/${mine.id}`)
    expect(one.body.message.subject).toBe('Choose a new Evenhand password')
    expect(one.body.message.text).toContain('/reset-password?token=')
    expect(one.body.message.html).toContain('href="http://')
    expect((await demo.get('/api/dev/mail/..%2F..%2Fsession-password')).status).toBe(400)
    expect((await demo.get('/api/dev/mail/2020-01-01T00-00-00-000Z-00000000.eml')).status).toBe(404)
    const page = await demo.request('GET', `/dev/mail/${mine.id}`)
    expect(page.status).toBe(200)
  })
})
