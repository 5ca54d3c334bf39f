// The guardians' weekly summary, queued by `npm run mail:weekly` and read back from the local mail server.
import { execFile } from 'node:child_process'
import { randomUUID } from 'node:crypto'
import { join } from 'node:path'
import { promisify } from 'node:util'
import { afterAll, describe, expect, it } from 'vitest'
import { baseUrl, Client, closeTestDb, testDb } from '../support/server'
import { linkIn, waitForMail } from '../support/mail'
import { attemptRowCopier } from '../support/attempts'
import { hashPassword } from '../../scripts/lib/password'

afterAll(closeTestDb)

const ROOT = join(import.meta.dirname, '../..')
const DAY_MS = 86_400_000

async function mailWeekly(week: string): Promise<{ weekStart: string, queued: number, alreadyQueued: number }> {
  const { stdout } = await promisify(execFile)('node', ['--import', 'tsx', 'scripts/mail-weekly.ts', '--week', week], {
    cwd: ROOT, env: { ...process.env, NUXT_APP_URL: baseUrl() },
  })
  return JSON.parse(stdout)
}

/** Monday 00:00 UTC of the last complete week, worked out here by hand from today's date. */
function lastMonday(): Date {
  const now = new Date()
  const today = Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate())
  const daysSinceMonday = (now.getUTCDay() + 6) % 7
  return new Date(today - (daysSinceMonday + 7) * DAY_MS)
}

describe('the weekly summary', () => {
  it('tells a guardian the week\'s minutes, attempts, scores against goals and new comments, once', async () => {
    const monday = lastMonday()
    const week = monday.toISOString().slice(0, 10)
    const ada = await testDb()('users').where({ email: 'ada@evenhand.test' }).first('id', 'guardian_email')
    const guardian = `ada-guardian-${Date.now()}@example.org`
    // Ada's days are UTC days here; the next test puts a student in another zone.
    await testDb()('users').where({ id: ada.id }).update({ guardian_email: guardian, guardian_summary_stopped_at: null, time_zone: null })

    const attempts = await testDb()('attempts').where('student_id', ada.id)
      .where('started_at', '>=', monday).where('started_at', '<', new Date(monday.getTime() + 7 * DAY_MS))
      .select('id', 'started_at', 'events')
    expect(attempts.length).toBeGreaterThan(0)
    // Minutes per day from the raw events, first to last event of each attempt.
    const perDay = new Map<number, { ms: number, n: number }>()
    for (const a of attempts) {
      const events = (typeof a.events === 'string' ? JSON.parse(a.events) : a.events) as { timeMs: number }[]
      const times = events.map(e => e.timeMs)
      const day = Math.floor((new Date(a.started_at).getTime() - monday.getTime()) / DAY_MS)
      const entry = perDay.get(day) ?? { ms: 0, n: 0 }
      perDay.set(day, { ms: entry.ms + Math.max(...times) - Math.min(...times), n: entry.n + 1 })
    }
    const total = [...perDay.values()].reduce((sum, d) => sum + d.ms, 0) / 60_000
    const totalWords = total < 1 ? 'less than a minute' : `${Math.round(total)} minute${Math.round(total) === 1 ? '' : 's'}`

    const teacher = await testDb()('users').where({ email: 'teacher@evenhand.test' }).first('id')
    await testDb()('comments').insert({ attempt_id: attempts[0]!.id, teacher_id: teacher.id, body: 'Keep the wrist level through the thumb passing.', created_at: new Date(monday.getTime() + 2 * DAY_MS) })
    await testDb()('comments').insert({ attempt_id: attempts[0]!.id, teacher_id: teacher.id, body: 'An older remark, from before the week.', created_at: new Date(monday.getTime() - DAY_MS) })

    const first = await mailWeekly(week)
    expect(first.weekStart).toBe(week)
    expect(first.queued).toBeGreaterThanOrEqual(1)
    const [mail] = await waitForMail(guardian)
    const text = mail!.parsed.text!
    expect(mail!.parsed.subject).toMatch(/^Ada Lindqvist's piano practice, week of Monday/)
    expect(text).toContain(`${attempts.length} attempt${attempts.length === 1 ? '' : 's'} in all.`)
    expect(text).toContain(`played drills for ${totalWords} on ${perDay.size} day${perDay.size === 1 ? '' : 's'}`)
    expect(text).toContain('Keep the wrist level through the thumb passing.')
    expect(text).not.toContain('An older remark')
    expect(text).toMatch(/best score \d+|not played this week/)
    expect(mail!.parsed.html).toContain('<table')
    expect(mail!.parsed.headerLines.find(l => l.key === 'list-unsubscribe')?.line).toContain('/unsubscribe?token=')

    // The same week again queues nothing for Ada.
    const again = await mailWeekly(week)
    expect(again.queued).toBe(0)
    expect(await testDb()('weekly_summaries').where({ student_id: ada.id, week_start: week }).count({ n: '*' })).toEqual([{ n: 1 }])

    // The unsubscribe link works without signing in, twice over, and stops the next week's summary.
    const link = linkIn(mail!, '/unsubscribe')
    expect((await fetch(link)).status).toBe(200)
    const stop = await new Client().post('/api/guardian/unsubscribe', { token: link.searchParams.get('token') })
    expect(stop.status).toBe(200)
    expect(stop.body.message).toContain('Ada Lindqvist')
    expect((await new Client().post('/api/guardian/unsubscribe', { token: link.searchParams.get('token') })).status).toBe(200)
    expect((await testDb()('users').where({ id: ada.id }).first('guardian_summary_stopped_at')).guardian_summary_stopped_at).not.toBeNull()
    const next = new Date(monday.getTime() + 7 * DAY_MS).toISOString().slice(0, 10)
    await mailWeekly(next)
    expect(await testDb()('weekly_summaries').where({ student_id: ada.id, week_start: next }).first()).toBeUndefined()
  })

  it('counts the week and its days on the clock of the student\'s own zone', async () => {
    // The week of Monday 1 June 2026 in Los Angeles (UTC−7 in summer; the zone's rule, from memory)
    // runs from 07:00 UTC that Monday to 07:00 UTC on 8 June.
    const stamp = Date.now()
    const guardian = `west-guardian-${stamp}@example.org`
    const [id] = await testDb()('users').insert({ email: `west-${stamp}@evenhand.test`, name: 'Wes Coastal', role: 'student', password_hash: await hashPassword('west-coast-1'), guardian_email: guardian, time_zone: 'America/Los_Angeles' })
    const source = await testDb()('attempts').where('student_id', (await testDb()('users').where({ email: 'student@evenhand.test' }).first('id')).id)
      .first('drill_id', 'drill_version', 'tempo_bpm', 'input_device', 'events', 'score', 'result', 'engine_version')
    const copy = await attemptRowCopier(testDb())
    for (const at of [
      '2026-06-01T06:30:00Z', // Sunday 31 May, 23:30 on the clock there: the week before
      '2026-06-01T08:00:00Z', // Monday 1 June, 01:00
      '2026-06-08T05:00:00Z', // Sunday 7 June, 22:00: in UTC already the next week
      '2026-06-08T07:30:00Z', // Monday 8 June, 00:30: the next week
    ]) await testDb()('attempts').insert({ ...copy(source), id: randomUUID(), student_id: id, started_at: new Date(at) })

    expect((await mailWeekly('2026-06-03')).weekStart).toBe('2026-06-01')
    const [mail] = await waitForMail(guardian)
    const text = mail!.parsed.text!
    expect(text).toContain('with 2 attempts in all.')
    expect(text).toMatch(/on 2 days/)
    expect(text).toMatch(/Monday 1 Jun: [^\n]*, 1 attempt\n/)
    expect(text).toMatch(/Sunday 7 Jun: [^\n]*, 1 attempt\n/)
    expect(text).toMatch(/Tuesday 2 Jun: no practice\n/)
  })

  it('answers 404 for an unknown unsubscribe link and 400 for a malformed one', async () => {
    const unknown = await new Client().post('/api/guardian/unsubscribe', { token: 'z'.repeat(43) })
    expect(unknown.status).toBe(404)
    expect(unknown.body.message).toMatch(/not valid/)
    expect((await new Client().post('/api/guardian/unsubscribe', { token: 'short' })).status).toBe(400)
  })
})
