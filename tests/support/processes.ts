// What tests that start a whole program of their own (`npm start`, `nuxi dev`) share: a port nobody holds, and
// stopping the program with everything it started, as a supervisor would.
import { createServer } from 'node:net'

/** A port free on 127.0.0.1 at the time of asking. */
export async function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const server = createServer().listen(0, '127.0.0.1', () => {
      const { port } = server.address() as { port: number }
      server.close(() => resolve(port))
    })
  })
}

/** Whether any process of the group led by `pid` is still alive. */
export function groupAlive(pid: number): boolean {
  try {
    process.kill(-pid, 0)
    return true
  }
  catch {
    return false
  }
}

/**
 * SIGTERM to the group led by `pid` (a child spawned with `detached: true`), then waits for the last of it, as the
 * leader may end before what it started; what still runs after `graceMs` is killed.
 */
export async function stopGroup(pid: number, graceMs: number): Promise<void> {
  if (groupAlive(pid)) process.kill(-pid, 'SIGTERM')
  const end = Date.now() + graceMs
  while (groupAlive(pid) && Date.now() < end) await new Promise(resolve => setTimeout(resolve, 200))
  if (groupAlive(pid)) process.kill(-pid, 'SIGKILL')
}
