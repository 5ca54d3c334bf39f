// Account changes: name, guardian, password, and those that go through an e-mailed link (password resets, e-mail changes).
import type { Knex } from 'knex'
import type { User } from '#auth-utils'
import type { Account, Role } from '#shared/types/account'

/** An absolute address in this app for an e-mailed link (runtimeConfig.appUrl, e.g. https://studio.example.org). */
export function appLink(path: string, token?: string): string {
  const base = String(useRuntimeConfig().appUrl).replace(/\/+$/, '')
  return `${base}${path}${token ? `?token=${encodeURIComponent(token)}` : ''}`
}

class NoSuchAccount extends Error {}

/**
 * Queues a one-hour reset link to `email`. For an address with no account the same work is done
 * (token, rendering, outbox row) and then rolled back, so neither the answer nor its timing tells who has an account.
 */
export async function sendPasswordReset(email: string, requestedBy: string | null = null): Promise<void> {
  try {
    await useDb().transaction(async (trx) => {
      const user = await trx('users').where({ email }).first('id', 'name')
      const userId = user ? Number(user.id) : null
      // A new link ends the older ones; 0 matches no account when there is none.
      await retireTokens(trx, userId ?? 0, 'password-reset')
      const token = await issueToken(trx, { kind: 'password-reset', userId, ttlMs: HOUR_MS })
      await queueMail(trx, { to: email, template: 'password-reset', data: { name: user?.name ?? email, link: appLink('/reset-password', token), requestedBy } })
      if (!user) throw new NoSuchAccount()
    })
  }
  catch (error) {
    if (!(error instanceof NoSuchAccount)) throw error
  }
}

const RESET_MESSAGES = {
  unknown: 'This password link is not valid. Check that it was copied whole, or ask for a new one on the sign-in page.',
  expired: 'This password link has expired (links work for one hour). Ask for a new one on the sign-in page.',
  used: 'This password link has already been used. Ask for a new one on the sign-in page if you need it again.',
}

/** Sets a new password from a reset link; returns the account so the caller can sign it in. */
export async function resetPassword(token: string, password: string): Promise<{ id: number, email: string, name: string, role: Role }> {
  const passwordHash = await hashPassword(password)
  return useDb().transaction(async (trx: Knex.Transaction) => {
    const row = await redeemToken(trx, 'password-reset', token, RESET_MESSAGES)
    const user = await trx('users').where({ id: row.userId ?? 0 }).first('id', 'email', 'name', 'role')
    if (!user) throw createError({ statusCode: 404, statusMessage: 'Not found', message: RESET_MESSAGES.unknown })
    await trx('users').where({ id: user.id }).update({ password_hash: passwordHash })
    await retireTokens(trx, Number(user.id), 'password-reset')
    return { id: Number(user.id), email: user.email, name: user.name, role: user.role }
  })
}

/** The account as its owner sees it on the settings page. */
export async function loadAccount(db: Knex, userId: number): Promise<Account> {
  const row = await db('users').where({ id: userId }).first('id', 'name', 'email', 'role', 'guardian_email', 'guardian_summary_stopped_at')
  if (!row) throw createError({ statusCode: 404, statusMessage: 'Not found', message: 'This account no longer exists' })
  // A new link retires the older ones (requestEmailChange), so at most one is live.
  const pending = await db('one_time_tokens').where({ user_id: userId, kind: 'email-change' }).whereNull('used_at')
    .where('expires_at', '>', new Date()).orderBy('id', 'desc').first('subject', 'expires_at')
  return {
    id: Number(row.id),
    name: row.name,
    email: row.email,
    role: row.role,
    guardianEmail: row.guardian_email ?? null,
    guardianSummaryStopped: Boolean(row.guardian_summary_stopped_at),
    pendingEmail: pending ? { email: pending.subject, expiresAt: new Date(pending.expires_at).toISOString() } : null,
  }
}

/** Sets a student's guardian address; a new address starts the weekly summary again, as its owner never stopped it. */
export async function setGuardianEmail(db: Knex | Knex.Transaction, studentId: number, guardianEmail: string | null): Promise<void> {
  const current = await db('users').where({ id: studentId }).first('guardian_email')
  if (current && current.guardian_email === guardianEmail) return
  await db('users').where({ id: studentId }).update({ guardian_email: guardianEmail, guardian_summary_stopped_at: null })
}

/** The password hash check shared by the account changes that need the current password. */
export async function requireCurrentPassword(db: Knex, userId: number, password: string): Promise<void> {
  const row = await db('users').where({ id: userId }).first('password_hash')
  if (!row?.password_hash || !(await verifyPassword(row.password_hash, password))) {
    throw createError({
      statusCode: 400,
      statusMessage: 'Invalid input',
      message: 'currentPassword: This is not your current password',
      data: { issues: [{ path: 'currentPassword', message: 'This is not your current password' }] },
    })
  }
}

function emailTaken(): Error {
  return createError({ statusCode: 409, statusMessage: 'Conflict', message: 'email: Another account already uses this e-mail' })
}

/** Sends a confirmation link to the new address; the sign-in e-mail changes only when it is followed. */
export async function requestEmailChange(userId: number, email: string): Promise<void> {
  const db = useDb()
  if (await db('users').where({ email }).whereNot({ id: userId }).first('id')) throw emailTaken()
  await db.transaction(async (trx) => {
    const user = await trx('users').where({ id: userId }).first('name')
    await retireTokens(trx, userId, 'email-change')
    const token = await issueToken(trx, { kind: 'email-change', userId, subject: email, ttlMs: DAY_MS })
    await queueMail(trx, { to: email, template: 'email-change', data: { name: user.name, newEmail: email, link: appLink('/confirm-email', token) } })
  })
}

const CONFIRM_MESSAGES = {
  unknown: 'This confirmation link is not valid. Check that it was copied whole, or change the address again in Settings.',
  expired: 'This confirmation link has expired (links work for 24 hours). Change the address again in Settings for a new one.',
  used: 'This address has already been confirmed with this link.',
}

/** Follows an e-mail change link: the account's sign-in address becomes the new one. */
export async function confirmEmailChange(token: string): Promise<{ id: number, email: string, name: string, role: Role }> {
  return useDb().transaction(async (trx) => {
    const row = await redeemToken(trx, 'email-change', token, CONFIRM_MESSAGES)
    const email = row.subject ?? ''
    const user = await trx('users').where({ id: row.userId ?? 0 }).first('id', 'name', 'role')
    if (!user) throw createError({ statusCode: 404, statusMessage: 'Not found', message: CONFIRM_MESSAGES.unknown })
    try {
      await trx('users').where({ id: user.id }).update({ email })
    }
    catch (error) {
      if ((error as { code?: string }).code === 'ER_DUP_ENTRY') throw emailTaken()
      throw error
    }
    return { id: Number(user.id), email, name: user.name, role: user.role }
  })
}

/** A teacher's own student (a member of one of their classes, or given an assignment by them); 404 otherwise. */
export async function requireTaughtStudent(db: Knex, user: User, studentId: number): Promise<{ id: number, name: string, email: string }> {
  const student = await db('users').where({ id: studentId, role: 'student' }).first('id', 'name', 'email')
  if (!student || !(await mayReadStudent(db, user, studentId))) {
    throw createError({ statusCode: 404, statusMessage: 'Not found', message: 'Student not found' })
  }
  return { id: Number(student.id), name: student.name, email: student.email }
}

const UNSUBSCRIBE_UNKNOWN = 'This link is not valid. Check that it was copied whole from the weekly summary.'

/**
 * Follows a weekly summary's unsubscribe link: the summary stops for the address it was sent to.
 * Following it again answers the same; a newer guardian address the student entered since keeps its summary.
 */
export async function stopGuardianSummary(token: string): Promise<{ name: string }> {
  const db = useDb()
  const row = await findToken(db, 'guardian-unsubscribe', token)
  if (!row) throw createError({ statusCode: 404, statusMessage: 'Not found', message: UNSUBSCRIBE_UNKNOWN })
  if (!row.usedAt && row.expiresAt.getTime() < Date.now()) {
    throw createError({ statusCode: 410, statusMessage: 'Gone', message: 'This link has expired. The link in the newest weekly summary works.' })
  }
  const student = await db('users').where({ id: row.userId ?? 0 }).first('name')
  if (!student) throw createError({ statusCode: 404, statusMessage: 'Not found', message: UNSUBSCRIBE_UNKNOWN })
  const now = new Date()
  await db('users').where({ id: row.userId ?? 0, guardian_email: row.subject }).whereNull('guardian_summary_stopped_at').update({ guardian_summary_stopped_at: now })
  if (!row.usedAt) await db('one_time_tokens').where({ id: row.id }).update({ used_at: now })
  return { name: student.name }
}
