// The mail outbox. Code that causes an e-mail calls queueMail inside its own transaction, so the
// message exists exactly when the change does; a worker (server/plugins/mail-worker.ts) sends it later.
// Explicit imports only: `npm run mail:weekly` and the tests use this file outside Nitro.
import { hostname } from 'node:os'
import { randomBytes } from 'node:crypto'
import nodemailer from 'nodemailer'
import type { Transporter } from 'nodemailer'
import type { Knex } from 'knex'
import { renderMail } from '../mail/template'
import type { MailTemplate } from '../mail/template'
import { mailTemplates } from '../mail/templates'
import type { MailData, MailTemplateName } from '../mail/templates'

export interface QueuedMail<K extends MailTemplateName> {
  to: string
  template: K
  data: MailData<K>
}

/** Renders the template now and writes the message to the outbox; returns the outbox row's id. */
export async function queueMail<K extends MailTemplateName>(trx: Knex | Knex.Transaction, mail: QueuedMail<K>): Promise<number> {
  const rendered = await renderMail(mailTemplates[mail.template] as MailTemplate<MailData<K>>, mail.data)
  const [id] = await trx('mail_outbox').insert({
    to_email: mail.to,
    template: mail.template,
    subject: rendered.subject.slice(0, 200),
    text_body: rendered.text,
    html_body: rendered.html,
    unsubscribe_link: rendered.unsubscribeLink,
  })
  return Number(id)
}

export interface RetryPolicy {
  /** Wait after the first failure; each further failure doubles it. */
  baseMs: number
  /** The longest wait between two tries. */
  maxMs: number
}

export const DEFAULT_RETRY: RetryPolicy = { baseMs: 30_000, maxMs: 3_600_000 }

/** A refusal the mail server calls permanent (5xx) is given up after this many tries; outages are retried for ever. */
export const PERMANENT_FAILURE_TRIES = 3

/** How long to wait before try number `failedTries + 1`: base · 2^(failedTries − 1), capped. */
export function retryDelayMs(failedTries: number, policy: RetryPolicy = DEFAULT_RETRY): number {
  if (failedTries < 1) return 0
  // 2^30 already exceeds any sensible cap; stop the exponent there so the number stays finite.
  return Math.min(policy.maxMs, policy.baseMs * 2 ** Math.min(failedTries - 1, 30))
}

/** Whether an error from nodemailer is the mail server refusing the message for good (a 5xx reply). */
export function isPermanentFailure(error: unknown): boolean {
  const code = (error as { responseCode?: number }).responseCode
  return typeof code === 'number' && code >= 500 && code < 600
}

export interface SmtpSettings {
  host: string
  port: number | string
  from: string
  user?: string
  password?: string
  /** TLS from the first byte (port 465); otherwise STARTTLS when the server offers it. */
  secure?: boolean | string
}

export function createMailTransport(smtp: SmtpSettings): Transporter {
  return nodemailer.createTransport({
    host: smtp.host,
    port: Number(smtp.port),
    secure: smtp.secure === true || smtp.secure === 'true',
    auth: smtp.user ? { user: smtp.user, pass: smtp.password ?? '' } : undefined,
    // Short timeouts: a hung mail server must not hold a claim longer than CLAIM_MS.
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 30_000,
  })
}

/** A name for this worker that is unique across processes and machines. */
export function newWorkerId(): string {
  return `${hostname().slice(0, 40)}:${process.pid}:${randomBytes(4).toString('hex')}`
}

/** How long a claim lasts; longer than any send can take with the timeouts above. */
export const CLAIM_MS = 5 * 60_000

export interface DeliveryOptions {
  workerId: string
  from: string
  retry?: RetryPolicy
  batch?: number
}

export interface DeliveryReport {
  sent: number
  failed: number
}

/**
 * Claims due messages and sends them. The claim is one short transaction: rows are locked with
 * SELECT … FOR UPDATE SKIP LOCKED, so a second worker skips them instead of waiting, and stamped with
 * this worker's id for CLAIM_MS. Sending happens outside the transaction; each outcome is written
 * only while this worker still holds the claim.
 */
export async function deliverDue(db: Knex, transport: Transporter, options: DeliveryOptions): Promise<DeliveryReport> {
  const { workerId, from, retry = DEFAULT_RETRY, batch = 20 } = options
  const ids = await db.transaction(async (trx) => {
    const rows: { id: number }[] = await trx('mail_outbox')
      .select('id')
      .where('status', 'queued')
      .where('send_after', '<=', trx.raw('NOW(3)'))
      .where(q => q.whereNull('claimed_until').orWhere('claimed_until', '<', trx.raw('NOW(3)')))
      .orderBy('id')
      .limit(batch)
      .forUpdate()
      .skipLocked()
    if (!rows.length) return []
    const claimed = rows.map(r => Number(r.id))
    await trx('mail_outbox').whereIn('id', claimed).update({
      claimed_by: workerId,
      claimed_until: trx.raw('NOW(3) + INTERVAL ? MICROSECOND', [CLAIM_MS * 1000]),
    })
    return claimed
  })
  const report: DeliveryReport = { sent: 0, failed: 0 }
  for (const id of ids) {
    const row = await db('mail_outbox').where({ id, claimed_by: workerId }).first()
    if (!row) continue
    try {
      await transport.sendMail({
        from,
        to: row.to_email,
        subject: row.subject,
        text: row.text_body,
        html: row.html_body ?? undefined,
        headers: {
          'X-Evenhand-Outbox-Id': String(id),
          ...(row.unsubscribe_link ? { 'List-Unsubscribe': `<${row.unsubscribe_link}>` } : {}),
        },
      })
      await db('mail_outbox').where({ id, claimed_by: workerId })
        .update({ status: 'sent', sent_at: db.raw('NOW(3)'), tries: db.raw('tries + 1'), claimed_by: null, claimed_until: null, last_error: null })
      report.sent++
    }
    catch (error) {
      const tries = Number(row.tries) + 1
      const givenUp = isPermanentFailure(error) && tries >= PERMANENT_FAILURE_TRIES
      await db('mail_outbox').where({ id, claimed_by: workerId }).update({
        status: givenUp ? 'failed' : 'queued',
        tries,
        last_error: String((error as Error).message ?? error).slice(0, 2000),
        send_after: db.raw('NOW(3) + INTERVAL ? MICROSECOND', [retryDelayMs(tries, retry) * 1000]),
        claimed_by: null,
        claimed_until: null,
      })
      report.failed++
    }
  }
  return report
}
