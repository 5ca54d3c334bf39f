// The local mail server's messages, for /dev/mail. Only while the start or test script's own mail
// server is in use (runtimeConfig.mail.local), and only for the admin and the demo accounts.
import { readdir, readFile } from 'node:fs/promises'
import { join } from 'node:path'
import { simpleParser } from 'mailparser'
import type { AddressObject } from 'mailparser'
import type { H3Event } from 'h3'
import { z } from 'zod'
import type { DevMail, DevMailSummary } from '#shared/types/mail'
import { students, teacher } from '../../seeds/demo/studio'

/**
 * The seed's own accounts. Not every address on their domain: anyone may sign up with one (sign-up confirms
 * no address), and the box holds every account's password links.
 */
const DEMO_ACCOUNTS = new Set<string>([teacher.email, ...students.map(s => s.email)])

/** How many of the newest messages the list shows. */
const LIST_LIMIT = 200

export const DevMailParams = z.object({ id: z.string().regex(/^[\w-]{1,80}\.eml$/, { error: 'not a stored message' }) })

/** The folder of stored messages; a 404 for everyone where mail goes to a real provider, a 403 for other accounts. */
export async function requireDevMail(event: H3Event): Promise<string> {
  const { mail } = useRuntimeConfig()
  const notFound = createError({ statusCode: 404, statusMessage: 'Not found', message: 'Page not found' })
  if (!Number(mail.local) || !mail.dir) throw notFound
  const user = await requireRole(event)
  if (user.role !== 'admin' && !DEMO_ACCOUNTS.has(user.email)) {
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: 'The local mail box is open to the admin and the demo accounts' })
  }
  return String(mail.dir)
}

function addresses(value: AddressObject | AddressObject[] | undefined): string {
  return (Array.isArray(value) ? value : value ? [value] : []).map(a => a.text).join(', ')
}

async function parse(dir: string, id: string): Promise<DevMail> {
  const mail = await simpleParser(await readFile(join(dir, id)))
  return {
    id,
    date: mail.date?.toISOString() ?? null,
    from: addresses(mail.from),
    to: addresses(mail.to),
    subject: mail.subject ?? '(no subject)',
    text: mail.text ?? '',
    html: mail.html || null,
  }
}

export async function listDevMail(dir: string): Promise<DevMailSummary[]> {
  let files: string[] = []
  try {
    files = (await readdir(dir)).filter(f => DevMailParams.shape.id.safeParse(f).success)
  }
  catch { /* no message yet: the folder appears with the first one */ }
  // File names start with the time received, so the newest sort last.
  const newest = files.sort().reverse().slice(0, LIST_LIMIT)
  return Promise.all(newest.map(async (id) => {
    const { text: _text, html: _html, ...summary } = await parse(dir, id)
    return summary
  }))
}

export async function readDevMail(dir: string, id: string): Promise<DevMail> {
  try {
    return await parse(dir, id)
  }
  catch {
    throw createError({ statusCode: 404, statusMessage: 'Not found', message: 'This message is not in the local mail box' })
  }
}
