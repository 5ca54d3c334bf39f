import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { hashToken } from '../../server/utils/tokens'
import { Client, closeTestDb, testDb } from '../support/server'
import { linkIn, waitForMail } from '../support/mail'
import { newClass, newStudent, newTeacher, uniqueEmail } from '../support/studio'

afterAll(closeTestDb)

interface Invitation { id: number, email: string, status: string }
interface Detail { class: { students: { id: number }[], invitations: Invitation[] } }

let teacher: Client
let cls: { id: number, joinCode: string }

beforeAll(async () => {
  teacher = await newTeacher('Halima Brandt')
  cls = await newClass(teacher, 'Wednesday juniors')
})

/** Invites one address and returns the token its e-mail carries, read back through the local SMTP server. */
async function invite(email: string, nth = 1): Promise<{ id: number, token: string }> {
  const res = await teacher.post<{ invitations: Invitation[] }>(`/api/classes/${cls.id}/invitations`, { emails: [email] })
  expect(res.status).toBe(201)
  const mails = await waitForMail(email, nth)
  return { id: res.body.invitations[0]!.id, token: linkIn(mails[nth - 1]!, '/invitation').searchParams.get('token')! }
}

async function statusOf(id: number): Promise<string | undefined> {
  return (await teacher.get<Detail>(`/api/classes/${cls.id}`)).body.class.invitations.find(i => i.id === id)?.status
}

describe('invitations', () => {
  it('e-mails each address of a pasted list a one-time link, stored only as a hash, and the student signs up through it', async () => {
    const first = uniqueEmail('invited')
    const second = uniqueEmail('invited')
    const res = await teacher.post<{ invitations: Invitation[] }>(`/api/classes/${cls.id}/invitations`, { emails: [first.toUpperCase(), second, first] })
    expect(res.status).toBe(201)
    expect(res.body.invitations.map(i => [i.email, i.status]).sort()).toEqual([[first, 'pending'], [second, 'pending']].sort())
    const [mail] = await waitForMail(first)
    expect(mail!.parsed.subject).toBe('Halima Brandt invites you to Wednesday juniors on Evenhand')
    const link = linkIn(mail!, '/invitation')
    const token = link.searchParams.get('token')!
    const db = testDb()
    expect(await db('one_time_tokens').where({ token_hash: token }).first()).toBeUndefined()
    const stored = await db('one_time_tokens').where({ token_hash: hashToken(token) }).first('kind', 'subject', 'expires_at')
    expect(stored.kind).toBe('invitation')
    // Seven days, give or take the seconds the test took.
    expect(new Date(stored.expires_at).getTime() - Date.now()).toBeGreaterThan(7 * 86_400_000 - 120_000)
    expect(new Date(stored.expires_at).getTime() - Date.now()).toBeLessThanOrEqual(7 * 86_400_000)

    const student = new Client()
    const preview = await student.get(`/api/invitations/lookup?token=${encodeURIComponent(token)}`)
    expect(preview.body).toEqual({ invitation: { className: 'Wednesday juniors', teacherName: 'Halima Brandt', email: first, hasAccount: false } })
    const accepted = await student.post<{ user: { id: number, role: string, email: string } }>('/api/invitations/accept', { token, name: 'Pia Lindholm', password: 'long-enough-1' })
    expect(accepted.status).toBe(200)
    expect(accepted.body.user).toMatchObject({ role: 'student', email: first })
    // Signed in at once, in the class.
    const classes = await student.get<{ classes: { id: number }[] }>('/api/classes')
    expect(classes.body.classes.map(c => c.id)).toEqual([cls.id])
    expect(await statusOf(res.body.invitations.find(i => i.email === first)!.id)).toBe('accepted')

    const again = await new Client().post('/api/invitations/accept', { token, name: 'Someone', password: 'long-enough-1' })
    expect(again.status).toBe(410)
    expect(again.body.message).toMatch(/already been used/)
  })

  it('lets an address that has an account join with its password, and refuses a wrong one', async () => {
    const other = await newClass(teacher, 'Other class')
    const existing = await newStudent(other.joinCode)
    const { token } = await invite(existing.email)
    const preview = await new Client().get<{ invitation: { hasAccount: boolean } }>(`/api/invitations/lookup?token=${token}`)
    expect(preview.body.invitation.hasAccount).toBe(true)
    const wrong = await new Client().post('/api/invitations/accept', { token, password: 'not-the-password' })
    expect(wrong.status).toBe(401)
    expect(wrong.body.message).toBe('password: Wrong password for this e-mail')
    const right = await new Client().post<{ user: { id: number } }>('/api/invitations/accept', { token, password: 'long-enough-1' })
    expect(right.status).toBe(200)
    expect(right.body.user.id).toBe(existing.id)
    expect(await testDb()('class_members').where({ student_id: existing.id }).orderBy('class_id').pluck('class_id')).toEqual([cls.id, other.id].sort((a, b) => a - b))
  })

  it('answers 404 for an unknown link, 410 for an expired or withdrawn one, and a resent link replaces the old one', async () => {
    const unknown = await new Client().post('/api/invitations/accept', { token: 'x'.repeat(43), name: 'N', password: 'long-enough-1' })
    expect(unknown.status).toBe(404)
    expect(unknown.body.message).toMatch(/not valid/)
    expect((await new Client().post('/api/invitations/accept', { token: 'short', name: 'N', password: 'long-enough-1' })).status).toBe(400)

    const expiring = uniqueEmail('late')
    const late = await invite(expiring)
    await testDb()('one_time_tokens').where({ token_hash: hashToken(late.token) }).update({ expires_at: new Date(Date.now() - 1000) })
    const expired = await new Client().post('/api/invitations/accept', { token: late.token, name: 'N', password: 'long-enough-1' })
    expect(expired.status).toBe(410)
    expect(expired.body.message).toMatch(/expired/)
    await testDb()('invitations').where({ id: late.id }).update({ expires_at: new Date(Date.now() - 1000) })
    expect(await statusOf(late.id)).toBe('expired')

    // Sent again: a new link for 7 days; the old one stays dead.
    expect((await teacher.post(`/api/invitations/${late.id}/resend`)).status).toBe(200)
    const [, resent] = await waitForMail(expiring, 2)
    const fresh = linkIn(resent!, '/invitation').searchParams.get('token')!
    expect(fresh).not.toBe(late.token)
    expect(await statusOf(late.id)).toBe('pending')

    expect((await teacher.request('DELETE', `/api/invitations/${late.id}`)).status).toBe(204)
    expect(await statusOf(late.id)).toBe('revoked')
    const withdrawn = await new Client().post('/api/invitations/accept', { token: fresh, name: 'N', password: 'long-enough-1' })
    expect(withdrawn.status).toBe(410)
    expect(withdrawn.body.message).toMatch(/withdrawn/)
    expect(await testDb()('users').where({ email: expiring }).first()).toBeUndefined()
  })

  it('answers 409 for an address already in the class and e-mails nobody from that request', async () => {
    const member = await newStudent(cls.joinCode)
    const bystander = uniqueEmail('bystander')
    const res = await teacher.post(`/api/classes/${cls.id}/invitations`, { emails: [bystander, member.email] })
    expect(res.status).toBe(409)
    expect(res.body.message).toContain(member.email)
    expect(await testDb()('mail_outbox').where({ to_email: bystander }).count({ n: '*' })).toEqual([{ n: 0 }])
    expect(await testDb()('invitations').where({ email: bystander }).count({ n: '*' })).toEqual([{ n: 0 }])
  })

  it('refuses a teacher\'s address as a student, bad lists, and everyone but the class\'s teacher', async () => {
    const otherTeacherEmail = uniqueEmail('teacher')
    await new Client().post('/api/auth/register', { name: 'Other', email: otherTeacherEmail, password: 'long-enough-1' })
    const { id, token } = await invite(otherTeacherEmail)
    expect((await new Client().post('/api/invitations/accept', { token, password: 'long-enough-1' })).status).toBe(409)

    for (const emails of [[], ['not-an-address'], Array.from({ length: 101 }, (_, i) => `s${i}@evenhand.test`)]) {
      const res = await teacher.post(`/api/classes/${cls.id}/invitations`, { emails })
      expect(res.status).toBe(400)
      expect(String(res.body.message)).toMatch(/^emails/)
    }
    const stranger = await newTeacher('Stranger')
    expect((await stranger.post(`/api/classes/${cls.id}/invitations`, { emails: [uniqueEmail('x')] })).status).toBe(404)
    expect((await stranger.post(`/api/invitations/${id}/resend`)).status).toBe(404)
    expect((await stranger.request('DELETE', `/api/invitations/${id}`)).status).toBe(404)
    expect(await statusOf(id)).toBe('pending')
    const student = await newStudent(cls.joinCode)
    expect((await student.client.post(`/api/classes/${cls.id}/invitations`, { emails: [uniqueEmail('x')] })).status).toBe(403)
    expect((await student.client.post(`/api/invitations/${id}/resend`)).status).toBe(403)
    expect((await new Client().post(`/api/classes/${cls.id}/invitations`, { emails: [uniqueEmail('x')] })).status).toBe(401)
  })
})

describe('assignment e-mail', () => {
  it('tells each student of the class by e-mail, through the local SMTP server', async () => {
    const student = await newStudent(cls.joinCode, 'Oskar Venn')
    const [drill] = await testDb()('drills').where({ is_public: true }).pluck('id')
    const set = await teacher.post('/api/drill-sets', { title: 'Thirds in C', items: [{ drillId: Number(drill) }] })
    const dueOn = new Date(Date.now() + 4 * 86_400_000).toISOString().slice(0, 10)
    const res = await teacher.post('/api/assignments', { drillSetId: set.body.id, classId: cls.id, dueOn, timeZone: 'UTC', note: 'Hands separately first.' })
    expect(res.status).toBe(201)
    const [mail] = await waitForMail(student.email)
    expect(mail!.parsed.subject).toBe('New practice from Halima Brandt: Thirds in C')
    expect(mail!.parsed.text).toContain('Hello Oskar Venn')
    expect(mail!.parsed.text).toContain('Hands separately first.')
    expect(linkIn(mail!, '/student').pathname).toBe('/student')
  })
})
