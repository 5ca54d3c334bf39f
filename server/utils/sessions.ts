// Server-side session records behind the sealed cookie: sign-out, "sign out everywhere", a password
// change and an admin end sessions by deleting rows; a cookie whose row is gone, idle or expired is signed out.
import { randomBytes } from 'node:crypto'
import type { H3Event } from 'h3'
import type { User } from '#auth-utils'

/** A row's last use is written at most this often, so reading a session rarely costs a write. */
const TOUCH_EVERY_MS = 60_000

/**
 * Unsealing the cookie derives two keys with PBKDF2 and checks an HMAC on every request (9 % of the server's busy
 * time while saving attempts under load; DEVELOPERS.md, "Load test"). A sealed text always unseals to the same
 * session, so what it unsealed to is kept for a minute by that exact text, at most 10,000 of them. The session's
 * row is still read on every request below, so signing out, a new password or an idle or past lifetime end it at once.
 */
const UNSEALED_FOR_MS = 60_000
const UNSEALED_MAX = 10_000
interface Unsealed { at: number, session: { id: string, createdAt: number, data: Record<string, unknown> } }
const unsealed = new Map<string, Unsealed>()

/** The sealed session a request carries, where h3 looks for it: its `x-<name>-session` header, else the cookie. */
function sealedSession(event: H3Event, name: string): string | undefined {
  return getRequestHeader(event, `x-${name}-session`) ?? getCookie(event, name)
}

/** Hands h3 a session this server unsealed from the same text within the minute, so it need not unseal it again. */
function reuseUnsealed(event: H3Event, name: string, sealed: string | undefined, now: number): boolean {
  const hit = sealed ? unsealed.get(sealed) : undefined
  if (!hit) return false
  if (now - hit.at > UNSEALED_FOR_MS) {
    unsealed.delete(sealed!)
    return false
  }
  event.context.sessions ??= Object.create(null)
  event.context.sessions![name] = structuredClone(hit.session)
  return true
}

function keepUnsealed(event: H3Event, name: string, sealed: string, now: number): void {
  const session = event.context.sessions?.[name]
  if (!session) return
  // Map keeps insertion order: the first key is the oldest.
  if (unsealed.size >= UNSEALED_MAX) unsealed.delete(unsealed.keys().next().value!)
  unsealed.set(sealed, { at: now, session: structuredClone({ id: session.id, createdAt: session.createdAt, data: session.data }) })
}

function lifetimes(): { idleMs: number, absoluteMs: number } {
  const { sessions } = useRuntimeConfig()
  return { idleMs: Number(sessions.idleSeconds) * 1000, absoluteMs: Number(sessions.absoluteSeconds) * 1000 }
}

/** h3 reads the session from the request's cookie header each time it is asked: the rest of this request must not find it. */
function dropRequestCookie(event: H3Event, name: string): void {
  const header = event.node.req.headers.cookie
  if (!header) return
  event.node.req.headers.cookie = header.split(';').filter(part => part.split('=')[0]!.trim() !== name).join(';')
}

/** Signs `user` in: a new session row and a cookie naming it; the browser's time zone goes on the account. */
export async function startSession(event: H3Event, user: User): Promise<void> {
  const sid = randomBytes(32).toString('base64url')
  await useDb()('sessions').insert({ id: sid, user_id: user.id, expires_at: new Date(Date.now() + lifetimes().absoluteMs) })
  // The browser's zone at sign-in is the user's: their practice days follow it, whoever looks at them.
  const zone = browserTimeZone(event)
  if (zone) await useDb()('users').where({ id: user.id }).update({ time_zone: zone })
  await replaceUserSession(event, { user, secure: { sid }, loggedInAt: Date.now() })
}

/** Signs this browser out: its row and its cookie. */
export async function endSession(event: H3Event): Promise<void> {
  const session = await getUserSession(event)
  if (session.secure?.sid) await useDb()('sessions').where({ id: session.secure.sid }).delete()
  await clearUserSession(event)
}

/** Ends every session of a user (sign out everywhere, a new password, an admin's decision). */
export async function endSessionsOf(userId: number): Promise<number> {
  return useDb()('sessions').where({ user_id: userId }).delete()
}

/**
 * Checks the cookie's session against its row: gone, past its absolute lifetime or idle too long, the cookie is
 * cleared and the request goes on signed out. Otherwise the row's last use is brought up to date.
 */
export async function checkSession(event: H3Event): Promise<void> {
  const name = String(useRuntimeConfig().session.name)
  const sealed = sealedSession(event, name)
  const now = Date.now()
  const reused = reuseUnsealed(event, name, sealed, now)
  const session = await getUserSession(event)
  if (!session.user) return
  if (!reused && sealed) keepUnsealed(event, name, sealed, now)
  const sid = session.secure?.sid
  const db = useDb()
  const row = sid ? await db('sessions').where({ id: sid }).first('user_id', 'last_seen_at', 'expires_at') : undefined
  const lastSeen = row ? new Date(row.last_seen_at).getTime() : 0
  const alive = row && Number(row.user_id) === session.user.id && new Date(row.expires_at).getTime() > now && now - lastSeen < lifetimes().idleMs
  if (!alive) {
    if (sealed) unsealed.delete(sealed)
    if (row) await db('sessions').where({ id: sid }).delete()
    await clearUserSession(event)
    dropRequestCookie(event, name)
    return
  }
  if (now - lastSeen > TOUCH_EVERY_MS) await db('sessions').where({ id: sid }).update({ last_seen_at: new Date(now) })
}
