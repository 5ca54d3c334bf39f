// The test stack's own MariaDB (scripts/lib/common.sh starts it from .data/mariadb-test on DB_TEST_PORT),
// stopped and started again for the outage tests. Only that server is ever touched: its pid comes from the
// pid file in this clone's data folder, and its command line must name this clone's data folder and the
// port the test database is on, or nothing is done.
import { spawn } from 'node:child_process'
import { readFile } from 'node:fs/promises'
import { connect } from 'node:net'
import { join, resolve } from 'node:path'

const DIR = resolve(import.meta.dirname, '../../.data/mariadb-test')

export interface TestMariadb {
  pid: number
  argv: string[]
  port: number
}

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0)
    return true
  }
  catch {
    return false
  }
}

async function until(what: string, check: () => boolean | Promise<boolean>, timeoutMs: number): Promise<void> {
  const end = Date.now() + timeoutMs
  while (!(await check())) {
    if (Date.now() > end) throw new Error(`timed out waiting until ${what}`)
    await new Promise(r => setTimeout(r, 100))
  }
}

function accepts(port: number): Promise<boolean> {
  return new Promise((done) => {
    const socket = connect(port, '127.0.0.1')
    socket.once('connect', () => {
      socket.destroy()
      done(true)
    })
    socket.once('error', () => done(false))
  })
}

/** The running test MariaDB, checked to be this clone's server on the test database's port. */
export async function testMariadb(): Promise<TestMariadb> {
  const port = Number(process.env.NUXT_DB_PORT)
  if (!port) throw new Error('NUXT_DB_PORT is not set: run the fault tests through `npm test`')
  const pid = Number((await readFile(join(DIR, 'mariadb.pid'), 'utf8')).trim())
  const argv = (await readFile(`/proc/${pid}/cmdline`, 'utf8')).split('\0').filter(Boolean)
  if (!argv.includes(`--port=${port}`) || !argv.includes(`--datadir=${join(DIR, 'db')}`)) {
    throw new Error(`process ${pid} is not the test stack's MariaDB on port ${port}; refusing to touch it`)
  }
  return { pid, argv, port }
}

/** Stops the test MariaDB as an operator would (SIGTERM is mariadbd's normal shutdown) and waits until it is gone. */
export async function stopTestMariadb(server: TestMariadb): Promise<void> {
  process.kill(server.pid, 'SIGTERM')
  await until('MariaDB has stopped', () => !alive(server.pid), 60_000)
}

/** Starts it again with the very command line it had, detached (the test stack's shutdown stops it through its socket). */
export async function startTestMariadb(server: TestMariadb): Promise<TestMariadb> {
  const child = spawn(server.argv[0]!, server.argv.slice(1), { detached: true, stdio: 'ignore' })
  child.unref()
  await until('MariaDB accepts connections again', () => accepts(server.port), 60_000)
  // Its pid file may come later than its port; the child's pid is the server's own.
  return { ...server, pid: child.pid! }
}
