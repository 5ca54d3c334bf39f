// Account changes that go through an e-mailed link: password resets and e-mail changes.
import type { Knex } from 'knex'

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
export async function resetPassword(token: string, password: string): Promise<{ id: number, email: string, name: string, role: 'teacher' | 'student' | 'admin' }> {
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
