// What the integration and browser tests share: the test server that scripts/test.sh started,
// a cookie-keeping client, and a connection to the same test database.
import knex from 'knex'
import type { Knex } from 'knex'
import { connectionFromEnv, knexConfig } from '../../knexfile'

export const DEMO_PASSWORD = 'evenhand-demo'

export function baseUrl(): string {
  const url = process.env.EVENHAND_TEST_URL
  if (!url) throw new Error('EVENHAND_TEST_URL is not set: run the integration tests through `npm test`')
  return url
}

export interface Reply<T = unknown> {
  status: number
  body: T
  headers: Headers
}

/** A tiny HTTP client that keeps the session cookie between calls, like a browser would. */
export class Client {
  private cookie = ''

  /** A reply in JSON is parsed, one in text kept as text, and anything else (a MIDI file, say) is its bytes. */
  async request<T = Record<string, unknown>>(method: string, path: string, body?: unknown, raw?: string | FormData, extraHeaders: Record<string, string> = {}): Promise<Reply<T>> {
    const headers: Record<string, string> = { accept: 'application/json' }
    if (this.cookie) headers.cookie = this.cookie
    // A FormData body sets its own multipart content type and boundary.
    if (body !== undefined || typeof raw === 'string') headers['content-type'] = 'application/json'
    Object.assign(headers, extraHeaders)
    const res = await fetch(baseUrl() + path, { method, headers, body: raw ?? (body === undefined ? undefined : JSON.stringify(body)) })
    const setCookie = res.headers.getSetCookie().map(c => c.split(';')[0]!).filter(Boolean)
    if (setCookie.length) this.cookie = setCookie.join('; ')
    if (!/json|text|xml/.test(res.headers.get('content-type') ?? 'text')) {
      return { status: res.status, body: new Uint8Array(await res.arrayBuffer()) as T, headers: res.headers }
    }
    const text = await res.text()
    let parsed: unknown = text
    try {
      parsed = JSON.parse(text)
    }
    catch { /* not JSON: keep the text */ }
    return { status: res.status, body: parsed as T, headers: res.headers }
  }

  /** The session cookie as a browser would send it, for requests made by hand. */
  get cookieHeader(): string {
    return this.cookie
  }

  get<T = Record<string, unknown>>(path: string): Promise<Reply<T>> {
    return this.request<T>('GET', path)
  }

  post<T = Record<string, unknown>>(path: string, body?: unknown): Promise<Reply<T>> {
    return this.request<T>('POST', path, body)
  }

  /** A multipart upload, as a browser's form sends it: the file under `file`, the rest as text fields. */
  upload<T = Record<string, unknown>>(path: string, file: { name: string, bytes: Uint8Array | string } | null, fields: Record<string, string> = {}): Promise<Reply<T>> {
    const form = new FormData()
    if (file) form.append('file', new Blob([file.bytes as BlobPart]), file.name)
    for (const [name, value] of Object.entries(fields)) form.append(name, value)
    return this.request<T>('POST', path, undefined, form)
  }

  async signIn(email: string, password = DEMO_PASSWORD): Promise<this> {
    const res = await this.post('/api/auth/login', { email, password })
    if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status}`)
    return this
  }
}

let db: Knex | undefined
export function testDb(): Knex {
  db ??= knex(knexConfig(connectionFromEnv(), { min: 0, max: 2 }))
  return db
}

export async function closeTestDb(): Promise<void> {
  await db?.destroy()
  db = undefined
}
