// Rate limits held in MariaDB's rate_limits table (shared by every app instance), equal work for known and
// unknown e-mails at sign-in, the password rule, password links, and attempts per student per minute.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { Client, closeTestDb, testDb } from '../support/server'
import { LOOPBACK_ADDRESSES, makeAccount, TEST_PASSWORD } from '../support/accounts'
import { attemptBody, scaleDrill } from '../support/attempts'
import type { DrillReply } from '../support/attempts'
import { publicDrillIds } from '../support/studio'

afterAll(closeTestDb)

/** Fills a limit's shared counter for this machine's addresses, as many requests from another instance would. */
async function exhaust(prefix: string, keys: string[], seconds = 600): Promise<void> {
  const rows = keys.map(key => ({ key: `${prefix}:${key}`, points: 1_000_000, expire: Date.now() + seconds * 1000 }))
  await testDb()('rate_limits').insert(rows).onConflict('key').merge()
}

async function release(prefix: string, keys: string[]): Promise<void> {
  await testDb()('rate_limits').whereIn('key', keys.map(k => `${prefix}:${k}`)).delete()
}

function retryAfter(res: { headers: Headers }): number {
  return Number(res.headers.get('retry-after'))
}

describe('sign-in limits', () => {
  it('answers 429 with Retry-After after five wrong passwords for one account, even to the right one', async () => {
    const account = await makeAccount('teacher')
    const statuses: number[] = []
    for (let i = 0; i < 30; i++) statuses.push((await new Client().post('/api/auth/login', { email: account.email, password: `wrong-${i}-guess` })).status)
    expect(statuses.slice(0, 5)).toEqual([401, 401, 401, 401, 401])
    expect(new Set(statuses.slice(5))).toEqual(new Set([429]))
    const right = await new Client().post('/api/auth/login', { email: account.email, password: TEST_PASSWORD })
    expect(right.status).toBe(429)
    expect(retryAfter(right)).toBeGreaterThan(0)
    expect(retryAfter(right)).toBeLessThanOrEqual(900)
    // The count lives in MariaDB: clearing it there lets the account in again.
    await release('signInAccount', [account.email])
    expect((await new Client().post('/api/auth/login', { email: account.email, password: TEST_PASSWORD })).status).toBe(200)
  })

  it('answers 429 to any sign-in from an address whose shared counter is spent, and counts each failure', async () => {
    await exhaust('signInIp', LOOPBACK_ADDRESSES)
    try {
      const res = await new Client().post('/api/auth/login', { email: 'student@evenhand.test', password: 'evenhand-demo' })
      expect(res.status).toBe(429)
      expect(retryAfter(res)).toBeGreaterThan(0)
    }
    finally {
      await release('signInIp', LOOPBACK_ADDRESSES)
    }
    await new Client().post('/api/auth/login', { email: `nobody-${Date.now()}@evenhand.test`, password: 'some-guess-1' })
    const rows = await testDb()('rate_limits').whereIn('key', LOOPBACK_ADDRESSES.map(a => `signInIp:${a}`))
    expect(rows.map(r => r.points)).toEqual([1])
    await release('signInIp', LOOPBACK_ADDRESSES)
  })

  it('takes as long for an unknown e-mail as for a known one with a wrong password', async () => {
    const account = await makeAccount('teacher')
    const time = async (email: string): Promise<number> => {
      const start = performance.now()
      await new Client().post('/api/auth/login', { email, password: 'not-the-password' })
      return performance.now() - start
    }
    const known: number[] = []
    const unknown: number[] = []
    // Interleaved and only four against the account's limit of five, then the counter is cleared.
    for (let i = 0; i < 4; i++) {
      known.push(await time(account.email))
      unknown.push(await time(`nobody-${Date.now()}-${i}@evenhand.test`))
    }
    await release('signInAccount', [account.email])
    const median = (xs: number[]): number => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!
    // Before: about 47 ms against 3 ms. An scrypt check on both sides keeps them within a factor of two.
    expect(median(unknown) / median(known)).toBeGreaterThan(0.5)
  })
})

describe('sign-up', () => {
  it('answers 429 with Retry-After when the address\'s sign-ups are spent, and counts each one', async () => {
    await exhaust('signUpIp', LOOPBACK_ADDRESSES)
    const email = `limited-${Date.now()}@evenhand.test`
    try {
      const res = await new Client().post('/api/auth/register', { name: 'Tess Hale', email, password: 'plenty-of-words-2' })
      expect(res.status).toBe(429)
      expect(retryAfter(res)).toBeGreaterThan(0)
      expect(await testDb()('users').where({ email }).first()).toBeUndefined()
    }
    finally {
      await release('signUpIp', LOOPBACK_ADDRESSES)
    }
    expect((await new Client().post('/api/auth/register', { name: 'Tess Hale', email, password: 'plenty-of-words-2' })).status).toBe(201)
    const rows = await testDb()('rate_limits').whereIn('key', LOOPBACK_ADDRESSES.map(a => `signUpIp:${a}`))
    expect(rows.map(r => r.points)).toEqual([1])
    await release('signUpIp', LOOPBACK_ADDRESSES)
  })

  it.each([
    ['password', /common/],
    ['Password', /common/],
    ['12345678', /common/],
    ['qwertyuiop', /common/],
    ['        ', /spaces/],
    ['\t\t\t\t\t\t\t\t', /spaces/],
  ])('refuses the password %j with a 400 on the password field', async (password, reason) => {
    const email = `rule-${Date.now()}@evenhand.test`
    const res = await new Client().post('/api/auth/register', { name: 'Tess Hale', email, password })
    expect(res.status).toBe(400)
    expect(String(res.body.message)).toMatch(/^password:/)
    expect(String(res.body.message)).toMatch(reason)
    expect(await testDb()('users').where({ email }).first()).toBeUndefined()
  })

  it('refuses the account\'s own e-mail as its password', async () => {
    const email = `selfish-${Date.now()}@evenhand.test`
    const res = await new Client().post('/api/auth/register', { name: 'Tess Hale', email, password: email })
    expect(res.status).toBe(400)
    expect(String(res.body.message)).toMatch(/^password:.*e-mail/)
  })
})

describe('password links', () => {
  it('answers a known and an unknown e-mail alike: three 202s an hour, then 429 with Retry-After, and mails only the known one', async () => {
    const known = (await makeAccount('teacher')).email
    const unknown = `nobody-${Date.now()}@evenhand.test`
    const run = async (email: string): Promise<{ status: number, body: unknown, retryAfter: number }[]> => {
      const replies = []
      for (let i = 0; i < 5; i++) {
        const res = await new Client().post('/api/auth/forgot', { email })
        replies.push({ status: res.status, body: res.body, retryAfter: retryAfter(res) })
      }
      return replies
    }
    const [a, b] = [await run(known), await run(unknown)]
    expect(a.map(r => r.status)).toEqual([202, 202, 202, 429, 429])
    expect(b.map(r => r.status)).toEqual(a.map(r => r.status))
    expect(b.map(r => r.body)).toEqual(a.map(r => r.body))
    for (const r of [...a, ...b].filter(r => r.status === 429)) {
      expect(r.retryAfter).toBeGreaterThan(3000)
      expect(r.retryAfter).toBeLessThanOrEqual(3600)
    }
    // The address's case does not make a new counter.
    expect((await new Client().post('/api/auth/forgot', { email: known.toUpperCase() })).status).toBe(429)
    expect(await testDb()('mail_outbox').where({ to_email: known, template: 'password-reset' }).count({ n: '*' })).toEqual([{ n: 3 }])
    expect(await testDb()('mail_outbox').where({ to_email: unknown }).count({ n: '*' })).toEqual([{ n: 0 }])
  })

  it('answers 429 to any address once the client address\'s shared counter is spent', async () => {
    const { email } = await makeAccount('student')
    await exhaust('forgotIp', LOOPBACK_ADDRESSES, 3600)
    try {
      const res = await new Client().post('/api/auth/forgot', { email })
      expect(res.status).toBe(429)
      expect(retryAfter(res)).toBeGreaterThan(0)
      expect(await testDb()('mail_outbox').where({ to_email: email }).count({ n: '*' })).toEqual([{ n: 0 }])
    }
    finally {
      await release('forgotIp', LOOPBACK_ADDRESSES)
    }
    expect((await new Client().post('/api/auth/forgot', { email })).status).toBe(202)
  })
})

/** A drill of the shared library, which any student may play. */
async function publicDrill(student: Client): Promise<DrillReply> {
  return (await student.get<DrillReply>(`/api/drills/${(await publicDrillIds())[0]}`)).body
}

describe('attempts per student per minute', () => {
  let noor: Client
  let noorId: string
  beforeAll(async () => {
    noor = await new Client().signIn('student@evenhand.test')
    noorId = String((await testDb()('users').where({ email: 'student@evenhand.test' }).first('id')).id)
  })

  it('answers 429 with Retry-After once the minute\'s attempts are spent, storing nothing, then takes the same attempt', async () => {
    const drill = await scaleDrill(noor)
    const body = attemptBody(drill)
    await exhaust('attempts', [noorId], 60)
    try {
      const res = await noor.post('/api/attempts', body)
      expect(res.status).toBe(429)
      expect(retryAfter(res)).toBeGreaterThan(0)
      expect(retryAfter(res)).toBeLessThanOrEqual(60)
      expect(await testDb()('attempts').where({ id: body.id }).first()).toBeUndefined()
    }
    finally {
      await release('attempts', [noorId])
    }
    expect((await noor.post('/api/attempts', body)).status).toBe(201)
  })

  // The counter is spent in one statement that hands the new count back (server/utils/rate-limits.ts).
  it('counts attempts sent at once exactly: the ones left are taken, every other is refused and stores nothing', async () => {
    const student = await makeAccount('student')
    const drill = await publicDrill(student.client)
    const limit = Number(process.env.NUXT_LIMITS_ATTEMPTS_PER_STUDENT_PER_MINUTE ?? 30)
    await testDb()('rate_limits').insert({ key: `attempts:${student.id}`, points: limit - 4, expire: Date.now() + 60_000 })
    const bodies = Array.from({ length: 10 }, () => attemptBody(drill))
    const statuses = await Promise.all(bodies.map(async body => (await student.client.post('/api/attempts', body)).status))
    expect(statuses.filter(s => s === 201)).toHaveLength(4)
    expect(statuses.filter(s => s === 429)).toHaveLength(6)
    expect(await testDb()('attempts').where({ student_id: student.id }).count({ n: '*' })).toEqual([{ n: 4 }])
    const row = await testDb()('rate_limits').where({ key: `attempts:${student.id}` }).first('points')
    expect(row.points).toBe(limit + 6)
    await release('attempts', [String(student.id)])
  })

  it('starts a new minute when the last one has ended, however many it spent', async () => {
    const student = await makeAccount('student')
    const drill = await publicDrill(student.client)
    await testDb()('rate_limits').insert({ key: `attempts:${student.id}`, points: 1_000_000, expire: Date.now() - 1000 })
    const before = Date.now()
    expect((await student.client.post('/api/attempts', attemptBody(drill))).status).toBe(201)
    const row = await testDb()('rate_limits').where({ key: `attempts:${student.id}` }).first('points', 'expire')
    expect(row.points).toBe(1)
    expect(Number(row.expire)).toBeGreaterThanOrEqual(before + 60_000)
    expect(Number(row.expire)).toBeLessThanOrEqual(Date.now() + 60_000)
    await release('attempts', [String(student.id)])
  })
})

describe('class codes', () => {
  it('answers 429 after ten wrong codes from one student, even to the right code', async () => {
    const student = await makeAccount('student')
    const statuses: number[] = []
    for (let i = 0; i < 12; i++) statuses.push((await student.client.post('/api/classes/join', { code: `ZZZZ${String(i).padStart(2, '0')}` })).status)
    expect(statuses.slice(0, 10)).toEqual(Array(10).fill(404))
    expect(statuses.slice(10)).toEqual([429, 429])
    const code = String((await testDb()('classes').whereNotNull('join_code').whereNull('archived_at').first('join_code')).join_code)
    expect((await student.client.post('/api/classes/join', { code })).status).toBe(429)
    await release('joinCode', [String(student.id)])
    try {
      expect((await student.client.post('/api/classes/join', { code })).status).toBe(200)
    }
    finally {
      // Other tests count the demo classes' members.
      await testDb()('class_members').where({ student_id: student.id }).delete()
    }
  })
})
