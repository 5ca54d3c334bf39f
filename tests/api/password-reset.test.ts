import { afterAll, describe, expect, it } from 'vitest'
import { hashToken } from '../../server/utils/tokens'
import { Client, closeTestDb, testDb } from '../support/server'
import { linkIn, mailTo, waitForMail } from '../support/mail'

afterAll(closeTestDb)

let counter = 0
/** A new teacher account with its own address, so its mail can be told apart from every other test's. */
async function newAccount(password = 'first-password-1'): Promise<{ email: string, password: string }> {
  const email = `reset-${Date.now()}-${++counter}@evenhand.test`
  const res = await new Client().post('/api/auth/register', { name: 'Mara Quist', email, password })
  expect(res.status).toBe(201)
  return { email, password }
}

async function resetLink(email: string, nth = 1): Promise<URL> {
  const mails = await waitForMail(email, nth)
  return linkIn(mails[nth - 1]!, '/reset-password')
}

describe('forgot password', () => {
  it('answers 202 with the same words for an unknown address, and queues nothing for it', async () => {
    const { email } = await newAccount()
    const unknown = `nobody-${Date.now()}@evenhand.test`
    const known = await new Client().post('/api/auth/forgot', { email })
    const stranger = await new Client().post('/api/auth/forgot', { email: unknown })
    expect(stranger.status).toBe(202)
    expect(known.status).toBe(202)
    expect(stranger.body).toEqual(known.body)
    expect(await testDb()('mail_outbox').where({ to_email: unknown }).count({ n: '*' })).toEqual([{ n: 0 }])
    expect(await testDb()('mail_outbox').where({ to_email: email, template: 'password-reset' }).count({ n: '*' })).toEqual([{ n: 1 }])
  })

  it('answers 400 naming the field for an address that is not one', async () => {
    const res = await new Client().post('/api/auth/forgot', { email: 'not-an-address' })
    expect(res.status).toBe(400)
    expect(String(res.body.message)).toMatch(/^email:/)
  })

  it('e-mails a link that sets a new password once, through the local mail server', async () => {
    const { email, password } = await newAccount()
    expect((await new Client().post('/api/auth/forgot', { email: email.toUpperCase() })).status).toBe(202)
    const [mail] = await waitForMail(email)
    expect(mail!.parsed.subject).toBe('Choose a new Evenhand password')
    expect(mail!.parsed.html).toContain('Choose a new password')
    const link = linkIn(mail!, '/reset-password')
    // Only the hash is stored, never the token the link carries.
    const token = link.searchParams.get('token')!
    expect(await testDb()('one_time_tokens').where({ token_hash: token }).first()).toBeUndefined()
    expect(await testDb()('one_time_tokens').where({ token_hash: hashToken(token) }).first()).toMatchObject({ kind: 'password-reset', used_at: null })

    // The link opens a page of ours, which posts the token back with the new password.
    const page = await fetch(link)
    expect(page.status).toBe(200)
    expect(await page.text()).toContain('Choose a new password')

    const browser = new Client()
    const reset = await browser.post('/api/auth/reset', { token, password: 'second-password-2' })
    expect(reset.status).toBe(200)
    expect(reset.body).toMatchObject({ user: { email } })
    expect((await browser.get('/api/drills')).status).toBe(200)

    expect((await new Client().post('/api/auth/login', { email, password })).status).toBe(401)
    expect((await new Client().post('/api/auth/login', { email, password: 'second-password-2' })).status).toBe(200)

    const again = await new Client().post('/api/auth/reset', { token, password: 'third-password-3' })
    expect(again.status).toBe(410)
    expect(again.body.message).toMatch(/already been used/)
    expect((await new Client().post('/api/auth/login', { email, password: 'third-password-3' })).status).toBe(401)
  })

  it('refuses an expired link with 410 and keeps the password', async () => {
    const { email, password } = await newAccount()
    await new Client().post('/api/auth/forgot', { email })
    const token = (await resetLink(email)).searchParams.get('token')!
    await testDb()('one_time_tokens').where({ token_hash: hashToken(token) }).update({ expires_at: new Date(Date.now() - 1000) })
    const res = await new Client().post('/api/auth/reset', { token, password: 'never-stored-9' })
    expect(res.status).toBe(410)
    expect(res.body.message).toMatch(/expired/)
    expect((await new Client().post('/api/auth/login', { email, password })).status).toBe(200)
  })

  it('makes the newest link the only one that works', async () => {
    const { email } = await newAccount()
    await new Client().post('/api/auth/forgot', { email })
    const first = (await resetLink(email, 1)).searchParams.get('token')!
    await new Client().post('/api/auth/forgot', { email })
    const second = (await resetLink(email, 2)).searchParams.get('token')!
    expect((await new Client().post('/api/auth/reset', { token: first, password: 'from-first-1' })).status).toBe(410)
    expect((await new Client().post('/api/auth/reset', { token: second, password: 'from-second-2' })).status).toBe(200)
    expect(await mailTo(email)).toHaveLength(2)
  })

  it('answers 404 for an unknown token and 400 naming the field for a bad body', async () => {
    const unknown = await new Client().post('/api/auth/reset', { token: 'x'.repeat(43), password: 'long-enough-1' })
    expect(unknown.status).toBe(404)
    expect(unknown.body.message).toMatch(/not valid/)
    const short = await new Client().post('/api/auth/reset', { token: 'abc', password: 'long-enough-1' })
    expect(short.status).toBe(400)
    expect(String(short.body.message)).toMatch(/^token:/)
    const weak = await new Client().post('/api/auth/reset', { token: 'x'.repeat(43), password: 'short' })
    expect(weak.status).toBe(400)
    expect(String(weak.body.message)).toMatch(/^password:/)
  })
})
