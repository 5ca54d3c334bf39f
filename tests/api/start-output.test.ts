// The start script's serve step under a supervisor: its output going to a file the caller opened, or to
// a socket (Node's piped stdio is a socketpair, as is systemd's journal). Runs the same serve_app that
// `npm start` runs, on the test build and database, on a port of its own.
import { spawn } from 'node:child_process'
import type { ChildProcess } from 'node:child_process'
import { closeSync, openSync, readFileSync, writeFileSync } from 'node:fs'
import { createServer } from 'node:net'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterEach, describe, expect, it } from 'vitest'

const ROOT = join(import.meta.dirname, '../..')

async function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const server = createServer().listen(0, '127.0.0.1', () => {
      const { port } = server.address() as { port: number }
      server.close(() => resolve(port))
    })
  })
}

let child: ChildProcess | undefined
afterEach(() => {
  // The script's own group: bash and the server it started.
  if (child?.pid && child.exitCode === null) process.kill(-child.pid, 'SIGTERM')
  child = undefined
})

function serve(port: number, stdio: 'pipe' | number): ChildProcess {
  const script = `source scripts/lib/common.sh; trap stop_app EXIT; trap 'exit 143' TERM; serve_app "$ROOT/.output-test" ${port}; log "serving on ${port}"; wait "$SERVER_PID"`
  child = spawn('bash', ['-c', script], { cwd: ROOT, detached: true, stdio: ['ignore', stdio, stdio], env: { ...process.env, NUXT_MAIL_POLL_MS: '0' } })
  return child
}

/** Polls `read` until it shows the script's "serving on PORT" line (written once its health check passed) or the script ends. */
async function untilServing(port: number, read: () => string): Promise<string> {
  const end = Date.now() + 40_000
  while (!read().includes(`serving on ${port}`) && child?.exitCode === null && Date.now() < end) {
    await new Promise(resolve => setTimeout(resolve, 200))
  }
  return read()
}

async function health(port: number): Promise<number> {
  return fetch(`http://127.0.0.1:${port}/api/health`).then(r => r.status, () => 0)
}

describe('the start script under a supervisor', () => {
  it('serves when its output is a socket, and the server writes into that socket', async () => {
    const port = await freePort()
    const proc = serve(port, 'pipe')
    let output = ''
    proc.stdout!.on('data', (chunk: Buffer) => (output += chunk))
    proc.stderr!.on('data', (chunk: Buffer) => (output += chunk))
    await untilServing(port, () => output)
    expect(output).not.toMatch(/No such device|stopped during start-up/)
    expect(output).toContain(`serving on ${port}`)
    expect(await health(port)).toBe(200)
    // Nitro's own start-up line comes from the server process, through the inherited socket.
    expect(output).toMatch(/Listening on/)
  }, 60_000)

  it('appends to a log file the caller opened instead of truncating it', async () => {
    const port = await freePort()
    const file = join(tmpdir(), `evenhand-start-${port}.log`)
    writeFileSync(file, 'earlier steps: install, migrate, build\n')
    const fd = openSync(file, 'a')
    serve(port, fd)
    closeSync(fd)
    const log = await untilServing(port, () => readFileSync(file, 'utf8'))
    expect(await health(port)).toBe(200)
    expect(log.startsWith('earlier steps: install, migrate, build\n')).toBe(true)
    expect(log).toMatch(/Listening on/)
  }, 60_000)
})
