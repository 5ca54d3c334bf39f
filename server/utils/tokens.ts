// One-time links: a random token goes into the e-mail, only its SHA-256 hash into the database,
// so whoever reads the database cannot use a link. Explicit imports: scripts use this file outside Nitro.
import { createHash, randomBytes } from 'node:crypto'
import { createError } from 'h3'
import type { Knex } from 'knex'

/** What a link is for; the kind is checked on use, so a reset token never confirms an address. */
export type TokenKind = 'password-reset' | 'email-change' | 'invitation' | 'guardian-unsubscribe'

export const HOUR_MS = 3_600_000
export const DAY_MS = 24 * HOUR_MS

export interface TokenRow {
  id: number
  kind: TokenKind
  userId: number | null
  subject: string | null
  expiresAt: Date
  usedAt: Date | null
}

/** Messages for a link that cannot be used, in words the person who clicked it understands. */
export interface TokenMessages {
  unknown: string
  expired: string
  used: string
}

const DEFAULT_MESSAGES: TokenMessages = {
  unknown: 'This link is not valid. Check that it was copied whole, or ask for a new one.',
  expired: 'This link has expired. Ask for a new one.',
  used: 'This link has already been used. Ask for a new one if you need it again.',
}

export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex')
}

/** A fresh token (32 random bytes, URL-safe) and the hash to store. */
export function newToken(): { token: string, hash: string } {
  const token = randomBytes(32).toString('base64url')
  return { token, hash: hashToken(token) }
}

type Db = Knex | Knex.Transaction

/** Stores a new one-time token and returns the token itself, which only the e-mail carries. */
export async function issueToken(db: Db, input: { kind: TokenKind, userId?: number | null, subject?: string | null, ttlMs: number }): Promise<string> {
  const { token, hash } = newToken()
  await db('one_time_tokens').insert({
    kind: input.kind,
    token_hash: hash,
    user_id: input.userId ?? null,
    subject: input.subject ?? null,
    expires_at: new Date(Date.now() + input.ttlMs),
  })
  return token
}

function toRow(row: Record<string, unknown>): TokenRow {
  return {
    id: Number(row.id),
    kind: row.kind as TokenKind,
    userId: row.user_id == null ? null : Number(row.user_id),
    subject: (row.subject as string | null) ?? null,
    expiresAt: new Date(row.expires_at as Date),
    usedAt: row.used_at ? new Date(row.used_at as Date) : null,
  }
}

/** The token's row whether or not it is still usable; undefined when no such token of this kind exists. */
export async function findToken(db: Db, kind: TokenKind, token: string): Promise<TokenRow | undefined> {
  const row = await db('one_time_tokens').where({ token_hash: hashToken(token), kind }).first()
  return row ? toRow(row) : undefined
}

/**
 * Uses a token once: marks it used and returns its row. A single conditional UPDATE does it, so two
 * clicks at the same moment cannot both succeed. Unknown: 404; expired or used: 410.
 */
export async function redeemToken(db: Db, kind: TokenKind, token: string, messages: Partial<TokenMessages> = {}): Promise<TokenRow> {
  const say = { ...DEFAULT_MESSAGES, ...messages }
  const now = new Date()
  const changed = await db('one_time_tokens')
    .where({ token_hash: hashToken(token), kind })
    .whereNull('used_at')
    .where('expires_at', '>', now)
    .update({ used_at: now })
  const row = await findToken(db, kind, token)
  if (!row) throw createError({ statusCode: 404, statusMessage: 'Not found', message: say.unknown })
  if (changed === 1) return { ...row, usedAt: now }
  throw createError({ statusCode: 410, statusMessage: 'Gone', message: row.usedAt ? say.used : say.expired })
}

/** Ends every unused token of this kind for the user, e.g. older reset links once a new one is sent. */
export async function retireTokens(db: Db, userId: number, kind: TokenKind): Promise<void> {
  await db('one_time_tokens').where({ user_id: userId, kind }).whereNull('used_at').update({ used_at: new Date() })
}
