// The outbox against the real local mail server: an outage delays mail and loses none, and several
// workers (the app's own and two more here) never send one message twice.
import knex from 'knex'
import type { Knex } from 'knex'
import { afterAll, afterEach, describe, expect, it } from 'vitest'
import { connectionFromEnv, knexConfig } from '../../knexfile'
import { createMailTransport, deliverDue, newWorkerId, queueMail } from '../../server/utils/mail'
import { Client, closeTestDb, testDb } from '../support/server'
import { setMailServer, storedMail } from '../support/mail'

afterAll(closeTestDb)
afterEach(() => setMailServer(true))

async function until(what: string, check: () => Promise<boolean>, timeoutMs = 20_000): Promise<void> {
  const end = Date.now() + timeoutMs
  while (!(await check())) {
    if (Date.now() > end) throw new Error(`timed out waiting until ${what}`)
    await new Promise(resolve => setTimeout(resolve, 100))
  }
}

async function rows(emails: string[]): Promise<{ id: number, to_email: string, status: string, tries: number, last_error: string | null }[]> {
  return testDb()('mail_outbox').whereIn('to_email', emails).orderBy('id').select('id', 'to_email', 'status', 'tries', 'last_error')
}

/** How many stored messages carry each outbox id. */
async function deliveries(ids: number[]): Promise<number[]> {
  const stored = await storedMail()
  return ids.map(id => stored.filter(m => m.outboxId === id).length)
}

describe('the mail outbox', () => {
  it('keeps mail queued through an outage and delivers each message once when the server is back', async () => {
    const stamp = Date.now()
    const emails = [1, 2, 3].map(n => `outage-${stamp}-${n}@evenhand.test`)
    for (const email of emails) {
      expect((await new Client().post('/api/auth/register', { name: 'Ona Vell', email, password: 'long-enough-1' })).status).toBe(201)
    }
    await setMailServer(false)
    for (const email of emails) expect((await new Client().post('/api/auth/forgot', { email })).status).toBe(202)

    // The app's worker tries, fails, and leaves every row queued with the error and a later try.
    await until('every row failed at least twice', async () => (await rows(emails)).every(r => r.tries >= 2))
    const failed = await rows(emails)
    expect(failed).toHaveLength(3)
    for (const row of failed) {
      expect(row.status).toBe('queued')
      expect(row.last_error).toMatch(/ECONNREFUSED|connect/i)
    }
    expect(await deliveries(failed.map(r => r.id))).toEqual([0, 0, 0])

    await setMailServer(true)
    await until('every row is sent', async () => (await rows(emails)).every(r => r.status === 'sent'))
    // A little longer, so a second send would have happened by now.
    await new Promise(resolve => setTimeout(resolve, 1500))
    expect(await deliveries(failed.map(r => r.id))).toEqual([1, 1, 1])
    expect((await rows(emails)).every(r => r.last_error === null)).toBe(true)
  })

  describe('with two more workers beside the app\'s own', () => {
    const pools: Knex[] = []
    afterAll(() => Promise.all(pools.map(p => p.destroy())))

    it('delivers every message exactly once', async () => {
      const stamp = Date.now()
      // Queued in one transaction and committed at once, so all the workers find them together.
      const ids = await testDb().transaction(async trx => Promise.all(Array.from({ length: 40 }, (_, n) => queueMail(trx, {
        to: `race-${stamp}-${n}@evenhand.test`,
        template: 'assignment',
        data: { studentName: 'Ona', teacherName: 'Wren Halloway', setTitle: `Set ${n}`, dueOn: '2026-12-18', note: null, link: 'http://127.0.0.1/student' },
      }))))
      const smtp = { host: '127.0.0.1', port: Number(process.env.NUXT_SMTP_PORT), from: 'Evenhand test <test@evenhand.test>' }
      const worker = async (): Promise<number> => {
        const db = knex(knexConfig(connectionFromEnv(), { min: 0, max: 2 }))
        pools.push(db)
        const transport = createMailTransport(smtp)
        const workerId = newWorkerId()
        let sent = 0
        for (let round = 0; round < 200; round++) {
          const report = await deliverDue(db, transport, { workerId, from: smtp.from, batch: 3 })
          sent += report.sent
          const left = await db('mail_outbox').whereIn('id', ids).whereNot('status', 'sent').count({ n: '*' })
          if (Number(left[0]!.n) === 0) break
        }
        transport.close()
        return sent
      }
      const [a, b] = await Promise.all([worker(), worker()])
      await until('every row is sent', async () => (await testDb()('mail_outbox').whereIn('id', ids).where('status', 'sent').count({ n: '*' }))[0]!.n === 40)
      await new Promise(resolve => setTimeout(resolve, 1000))
      expect(await deliveries(ids)).toEqual(ids.map(() => 1))
      // The workers here sent their share; the app's worker sent the rest. None sent one twice.
      expect(a + b).toBeLessThanOrEqual(40)
      expect(a + b).toBeGreaterThan(0)
    })
  })
})
