// The local mail server that scripts/test.sh started: read what it stored, and take it down and up again.
import { readdir, readFile } from 'node:fs/promises'
import { join } from 'node:path'
import { simpleParser } from 'mailparser'
import type { ParsedMail } from 'mailparser'

export function mailDir(): string {
  const dir = process.env.NUXT_MAIL_DIR
  if (!dir) throw new Error('NUXT_MAIL_DIR is not set: run the integration tests through `npm test`')
  return dir
}

export interface StoredMail {
  file: string
  parsed: ParsedMail
  outboxId: number
}

export async function storedMail(): Promise<StoredMail[]> {
  const files = (await readdir(mailDir())).filter(f => f.endsWith('.eml')).sort()
  return Promise.all(files.map(async (file) => {
    const parsed = await simpleParser(await readFile(join(mailDir(), file)))
    return { file, parsed, outboxId: Number(parsed.headers.get('x-evenhand-outbox-id')) }
  }))
}

function recipients(mail: ParsedMail): string[] {
  const to = Array.isArray(mail.to) ? mail.to : mail.to ? [mail.to] : []
  return to.flatMap(a => a.value.map(v => String(v.address).toLowerCase()))
}

export async function mailTo(address: string): Promise<StoredMail[]> {
  return (await storedMail()).filter(m => recipients(m.parsed).includes(address.toLowerCase()))
}

/** Waits until `count` messages to `address` are stored, and returns them oldest first. */
export async function waitForMail(address: string, count = 1, timeoutMs = 15_000): Promise<StoredMail[]> {
  const end = Date.now() + timeoutMs
  for (;;) {
    const found = await mailTo(address)
    if (found.length >= count) return found
    if (Date.now() > end) throw new Error(`expected ${count} message(s) to ${address}, found ${found.length} after ${timeoutMs} ms`)
    await new Promise(resolve => setTimeout(resolve, 150))
  }
}

/** The first link in the plain-text body whose path is `path`. */
export function linkIn(mail: StoredMail, path: string): URL {
  const links = (mail.parsed.text ?? '').match(/https?:\/\/\S+/g) ?? []
  const link = links.map(l => new URL(l)).find(u => u.pathname === path)
  if (!link) throw new Error(`no ${path} link in: ${mail.parsed.text}`)
  return link
}

function serverPid(): number {
  const pid = Number(process.env.EVENHAND_MAIL_SERVER_PID)
  if (!pid) throw new Error('EVENHAND_MAIL_SERVER_PID is not set: run the integration tests through `npm test`')
  return pid
}

/** Closes or reopens the mail server's port (scripts/mail-server.ts: SIGUSR1 closes, SIGUSR2 opens). */
export async function setMailServer(up: boolean): Promise<void> {
  process.kill(serverPid(), up ? 'SIGUSR2' : 'SIGUSR1')
  const port = Number(process.env.NUXT_SMTP_PORT)
  const { connect } = await import('node:net')
  const end = Date.now() + 5000
  for (;;) {
    const open = await new Promise<boolean>((resolve) => {
      const socket = connect(port, '127.0.0.1')
      socket.on('connect', () => (socket.destroy(), resolve(true))).on('error', () => resolve(false))
    })
    if (open === up) return
    if (Date.now() > end) throw new Error(`the mail server did not ${up ? 'open' : 'close'} port ${port}`)
    await new Promise(resolve => setTimeout(resolve, 50))
  }
}
