// `npm start` under a supervisor: its output going to a file the caller opened, or to a socket (Node's
// piped stdio is a socketpair, as is systemd's journal). The whole script runs: install check, its own
// MariaDB (in a scratch data folder, on a port of its own), migrations, seed, the local mail server and the
// app; it serves the test build, which `npm test` has just made from these sources, so nothing is rebuilt.
import { spawn } from 'node:child_process'
import type { ChildProcess } from 'node:child_process'
import { closeSync, mkdtempSync, openSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, afterEach, describe, expect, it } from 'vitest'
import { freePort, stopGroup } from '../support/processes'

const ROOT = join(import.meta.dirname, '../..')
// One scratch data folder for both runs: the second finds MariaDB's files made and the demo seeded.
const DATA = mkdtempSync(join(tmpdir(), 'evenhand-start-'))
afterAll(() => rmSync(DATA, { recursive: true, force: true }))

let child: ChildProcess | undefined
afterEach(async () => {
  // SIGTERM to the whole group, as a supervisor stops a service; the script then stops its MariaDB,
  // mail server and app. npm itself may end first, so this waits for the last of the group.
  if (child?.pid) await stopGroup(child.pid, 60_000)
  child = undefined
})

/** The environment of a newcomer's shell: none of the test stack's settings, which would point the script at it. */
function cleanEnv(ports: { app: number, db: number, smtp: number }): NodeJS.ProcessEnv {
  const env = Object.fromEntries(Object.entries(process.env).filter(([key]) => !key.startsWith('NUXT_') && !key.startsWith('EVENHAND_') && !/^(DB_|SMTP_|TEST_)?PORT$|^DB_TEST_PORT$|^SMTP_TEST_PORT$/.test(key)))
  return { ...env, PORT: String(ports.app), DB_PORT: String(ports.db), SMTP_PORT: String(ports.smtp), EVENHAND_DATA: DATA, EVENHAND_OUTPUT_DIR: join(ROOT, '.output-test') }
}

async function start(stdio: 'pipe' | number): Promise<{ proc: ChildProcess, port: number }> {
  const port = await freePort()
  const env = cleanEnv({ app: port, db: await freePort(), smtp: await freePort() })
  child = spawn('npm', ['start'], { cwd: ROOT, detached: true, stdio: ['ignore', stdio, stdio], env })
  return { proc: child, port }
}

/** Polls `read` until the script says the app is running (after its health check passed), or the script ends. */
async function untilRunning(read: () => string): Promise<string> {
  const end = Date.now() + 170_000
  while (!read().includes('Evenhand is running at') && child?.exitCode === null && Date.now() < end) {
    await new Promise(resolve => setTimeout(resolve, 250))
  }
  return read()
}

async function health(port: number): Promise<number> {
  return fetch(`http://127.0.0.1:${port}/api/health`).then(r => r.status, () => 0)
}

/** What a newcomer's log must keep: every step of the start, then the server's own lines. */
function expectEveryStep(log: string, port: number): void {
  expect(log).not.toMatch(/No such device|stopped during start-up/)
  expect(log).toMatch(/starting MariaDB \(mariadb\)/)
  expect(log).toMatch(/migrated \(batch \d+\)|database schema is up to date/)
  expect(log).toMatch(/seeded the demo studio|demo studio already present/)
  expect(log).toMatch(/starting the local mail server/)
  expect(log).toContain(`Evenhand is running at http://127.0.0.1:${port}`)
  // Nitro's own start-up line comes from the server process, through the inherited output.
  expect(log).toMatch(/Listening on/)
}

describe('npm start under a supervisor', () => {
  it('keeps every step in a log file the caller opened, after what the file held before', async () => {
    const file = join(DATA, 'start.log')
    writeFileSync(file, 'an earlier line of the supervisor\'s log\n')
    const fd = openSync(file, 'a')
    const { port } = await start(fd)
    closeSync(fd)
    const log = await untilRunning(() => readFileSync(file, 'utf8'))
    expect(await health(port)).toBe(200)
    expect(log.startsWith('an earlier line of the supervisor\'s log\n')).toBe(true)
    expectEveryStep(log, port)
  }, 240_000)

  it('starts and serves when its output is a socket', async () => {
    const { proc, port } = await start('pipe')
    let output = ''
    proc.stdout!.on('data', (chunk: Buffer) => (output += chunk))
    proc.stderr!.on('data', (chunk: Buffer) => (output += chunk))
    await untilRunning(() => output)
    expect(await health(port)).toBe(200)
    expectEveryStep(output, port)
  }, 240_000)
})
