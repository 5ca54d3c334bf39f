// Requests as an attacker sends them: dates MariaDB cannot hold, bodies larger than they claim,
// forms from other sites, and the headers every reply must carry.
import { request as httpRequest } from 'node:http'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { baseUrl, Client, closeTestDb, testDb } from '../support/server'
import { attemptBody, scaleDrill } from '../support/attempts'
import type { DrillReply } from '../support/attempts'

afterAll(closeTestDb)

let noor: Client
let drill: DrillReply
beforeAll(async () => {
  noor = await new Client().signIn('student@evenhand.test')
  drill = await scaleDrill(noor)
})

async function stored(id: unknown): Promise<number> {
  return (await testDb()('attempts').where({ id: String(id) })).length
}

/** Sends `totalBytes` of JSON in chunks with no Content-Length, as a streaming client may. */
function sendChunked(path: string, cookie: string, head: string, totalBytes: number): Promise<{ status: number, body: string }> {
  return new Promise((resolve, reject) => {
    const req = httpRequest(baseUrl() + path, { method: 'POST', headers: { 'content-type': 'application/json', 'transfer-encoding': 'chunked', cookie } }, (res) => {
      let body = ''
      res.on('data', (c: Buffer) => (body += c.toString()))
      res.on('end', () => resolve({ status: res.statusCode ?? 0, body }))
    })
    let answered = false
    req.on('response', () => (answered = true))
    // The server's close can overtake its 413 on the wire (the socket resets with our bytes unread): that too
    // means the body was not read whole, so it resolves as a reset rather than failing.
    req.on('error', (error: NodeJS.ErrnoException) => {
      if (answered) return
      if (error.code === 'EPIPE' || error.code === 'ECONNRESET') resolve({ status: 0, body: 'reset' })
      else reject(error)
    })
    req.write(head)
    const chunk = ' '.repeat(64 * 1024)
    let sent = head.length
    const pump = (): void => {
      while (sent < totalBytes) {
        sent += chunk.length
        if (!req.write(chunk)) return void req.once('drain', pump)
      }
      req.end('}')
    }
    pump()
  })
}

describe('dates and numbers MariaDB cannot hold', () => {
  it.each([
    ['1969-12-31T23:59:59Z'],
    ['2038-01-19T03:14:08Z'],
    ['9999-01-01T00:00:00Z'],
  ])('refuses startedAt %s with a 400 naming the field and stores nothing', async (startedAt) => {
    const body = attemptBody(drill, { startedAt })
    const res = await noor.post('/api/attempts', body)
    expect(res.status).toBe(400)
    expect(String(res.body.message)).toMatch(/^startedAt:/)
    expect(await stored(body.id)).toBe(0)
  })

  it('stores an attempt on the last second a TIMESTAMP holds', async () => {
    const body = attemptBody(drill, { startedAt: '2038-01-19T03:14:07Z' })
    expect((await noor.post('/api/attempts', body)).status).toBe(201)
    expect(await stored(body.id)).toBe(1)
  })

  it('refuses a drill version beyond INT UNSIGNED with a 400', async () => {
    const res = await noor.post('/api/attempts', attemptBody(drill, { drillVersion: 4_294_967_296 }))
    expect(res.status).toBe(400)
    expect(String(res.body.message)).toMatch(/^drillVersion:/)
  })
})

describe('the body limit counts the bytes read', () => {
  it('stops a chunked 30 MB body with 413', async () => {
    const res = await sendChunked('/api/attempts', noor.cookieHeader, '{"pad":"', 30 * 1024 * 1024)
    if (res.status !== 0) {
      expect(res.status).toBe(413)
      expect(res.body).toMatch(/larger than 2 MB/)
    }
  })

  it('refuses a chunked 3 MB attempt and stores nothing', async () => {
    const body = attemptBody(drill)
    const head = JSON.stringify(body).slice(0, -1) + ',"padding":"'
    const res = await sendChunked('/api/attempts', noor.cookieHeader, head, 3 * 1024 * 1024)
    expect([0, 413]).toContain(res.status)
    expect(await stored(body.id)).toBe(0)
  })

  it('still takes a chunked attempt under the limit', async () => {
    const body = attemptBody(drill)
    const json = JSON.stringify(body)
    const res = await sendChunked('/api/attempts', noor.cookieHeader, json.slice(0, -1), json.length)
    expect(res.status).toBe(201)
    expect(await stored(body.id)).toBe(1)
  })
})

describe('requests from other sites', () => {
  let teacher: Client
  let attemptId: string
  beforeAll(async () => {
    teacher = await new Client().signIn('teacher@evenhand.test')
    const body = attemptBody(drill)
    await noor.post('/api/attempts', body)
    attemptId = String(body.id)
  })

  async function comments(): Promise<number> {
    return (await testDb()('comments').where({ attempt_id: attemptId })).length
  }

  it('refuses a comment posted as a form, and stores nothing', async () => {
    const before = await comments()
    const res = await teacher.request('POST', `/api/attempts/${attemptId}/comments`, undefined, 'body=hello', { 'content-type': 'application/x-www-form-urlencoded' })
    expect(res.status).toBe(415)
    expect(await comments()).toBe(before)
  })

  it('refuses a sign-in sent as a cross-site form, and sets no cookie', async () => {
    const res = await new Client().request('POST', '/api/auth/login', undefined, 'email=student%40evenhand.test&password=evenhand-demo', {
      'content-type': 'application/x-www-form-urlencoded', 'origin': 'https://elsewhere.example', 'sec-fetch-site': 'cross-site',
    })
    expect(res.status).toBe(403)
    expect(res.headers.get('set-cookie')).toBeNull()
  })

  it.each([
    ['a foreign Origin', { origin: 'https://elsewhere.example' }],
    ['an opaque Origin', { origin: 'null' }],
    ['Sec-Fetch-Site cross-site', { 'sec-fetch-site': 'cross-site' }],
    ['Sec-Fetch-Site same-site (a sibling subdomain)', { 'sec-fetch-site': 'same-site' }],
  ])('refuses a JSON comment with %s', async (_, headers) => {
    const before = await comments()
    const res = await teacher.request('POST', `/api/attempts/${attemptId}/comments`, { body: 'from elsewhere' }, undefined, headers)
    expect(res.status).toBe(403)
    expect(await comments()).toBe(before)
  })

  it('takes the same comment from our own origin', async () => {
    const before = await comments()
    const res = await teacher.request('POST', `/api/attempts/${attemptId}/comments`, { body: 'Lovely evenness' }, undefined, { 'origin': baseUrl(), 'sec-fetch-site': 'same-origin' })
    expect(res.status).toBe(201)
    expect(await comments()).toBe(before + 1)
  })

  it('refuses a cross-site sign-out', async () => {
    const student = await new Client().signIn('student@evenhand.test')
    expect((await student.request('POST', '/api/auth/logout', undefined, undefined, { origin: 'https://elsewhere.example' })).status).toBe(403)
    expect((await student.get('/api/drills')).status).toBe(200)
  })
})

describe('security headers', () => {
  it('gives a page a nonce-based policy that every script tag carries, and no X-Powered-By', async () => {
    const res = await fetch(baseUrl() + '/login')
    const html = await res.text()
    const policy = res.headers.get('content-security-policy') ?? ''
    const nonce = /'nonce-([^']+)'/.exec(policy)?.[1]
    expect(nonce).toMatch(/^[A-Za-z0-9+/=]{16,}$/)
    expect(policy).toMatch(/frame-ancestors 'none'/)
    expect(policy).not.toMatch(/unsafe-eval|script-src[^;]*unsafe-inline/)
    const scripts = html.match(/<script\b[^>]*>/g) ?? []
    expect(scripts.length).toBeGreaterThan(0)
    for (const tag of scripts) expect(tag).toContain(`nonce="${nonce}"`)
    expect(res.headers.get('x-content-type-options')).toBe('nosniff')
    expect(res.headers.get('referrer-policy')).toBe('same-origin')
    expect(res.headers.get('x-powered-by')).toBeNull()
    const again = await fetch(baseUrl() + '/login')
    expect(again.headers.get('content-security-policy')).not.toContain(nonce)
  })

  it('sends the headers with API replies and errors too', async () => {
    for (const path of ['/api/health', '/api/drills']) {
      const res = await fetch(baseUrl() + path)
      expect(res.headers.get('x-content-type-options')).toBe('nosniff')
      expect(res.headers.get('content-security-policy')).toMatch(/frame-ancestors 'none'/)
      expect(res.headers.get('x-powered-by')).toBeNull()
    }
  })
})

describe('CSV export', () => {
  it('prefixes a cell a spreadsheet would run as a formula, and keeps numbers numbers', async () => {
    const db = testDb()
    const cls = await db('classes').where({ name: 'Tuesday Starters' }).first('id')
    const [userId] = await db('users').insert({ email: `formula-${Date.now()}@evenhand.test`, name: '=HYPERLINK("http://x.example","a")', role: 'student' })
    await db('class_members').insert({ class_id: cls.id, student_id: userId })
    try {
      const teacher = await new Client().signIn('teacher@evenhand.test')
      const res = await teacher.request('GET', `/api/classes/${cls.id}/progress.csv`)
      const rows = String(res.body).trimEnd().split('\r\n')
      const injected = rows.filter(r => r.includes('HYPERLINK'))
      expect(injected.length).toBeGreaterThan(0)
      for (const row of injected) expect(row).toMatch(/^Tuesday Starters,"'=HYPERLINK\(""http:\/\/x\.example"",""a""\)",/)
    }
    finally {
      await db('class_members').where({ student_id: userId }).delete()
      await db('users').where({ id: userId }).delete()
    }
  })
})
