// The local fake mail server of `npm start` and `npm test`: speaks real SMTP on loopback, delivers
// nothing, and stores every message it accepts as an .eml file for /dev/mail and the tests to read.
//   node --import tsx scripts/mail-server.ts PORT DIR
// SIGUSR1 closes the port (a mail outage, as the tests need one) and SIGUSR2 opens it again; SIGTERM or SIGINT stops it.
import { mkdirSync, renameSync, writeFileSync } from 'node:fs'
import { randomBytes } from 'node:crypto'
import { join } from 'node:path'
import { SMTPServer } from 'smtp-server'

const port = Number(process.argv[2])
const dir = process.argv[3] ?? ''
if (!Number.isInteger(port) || port <= 0 || !dir) {
  console.error('usage: mail-server.ts PORT DIR')
  process.exit(2)
}
mkdirSync(dir, { recursive: true })

// Sortable names: the newest message has the greatest name.
function fileName(): string {
  return `${new Date().toISOString().replace(/[:.]/g, '-')}-${randomBytes(4).toString('hex')}.eml`
}

function makeServer(): SMTPServer {
  return new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    banner: 'Evenhand local mail server; nothing leaves this machine',
    size: 10 * 1024 * 1024,
    // Stopping must not wait on a client that keeps its connection open.
    closeTimeout: 1000,
    onData(stream, _session, callback) {
      const chunks: Buffer[] = []
      stream.on('data', (chunk: Buffer) => chunks.push(chunk))
      stream.on('end', () => {
        try {
          // Written aside and renamed, so a reader never sees half a message.
          const name = fileName()
          writeFileSync(join(dir, `.${name}.part`), Buffer.concat(chunks))
          renameSync(join(dir, `.${name}.part`), join(dir, name))
          callback()
        }
        catch (error) {
          callback(error as Error)
        }
      })
    },
  })
}

let server: SMTPServer | undefined

function open(): void {
  if (server) return
  server = makeServer()
  server.on('error', error => console.error('[mail-server]', error.message))
  server.listen(port, '127.0.0.1', () => console.error(`[mail-server] listening on 127.0.0.1:${port}, storing mail in ${dir}`))
}

function close(then?: () => void): void {
  const current = server
  server = undefined
  if (!current) return then?.()
  current.close(() => then?.())
}

// While the port is closed nothing else keeps the process alive, so this does until a stop signal.
const keepAlive = setInterval(() => {}, 2 ** 30)
const stop = (): void => close(() => {
  clearInterval(keepAlive)
  process.exit(0)
})
process.on('SIGUSR1', () => close(() => console.error('[mail-server] closed (outage)')))
process.on('SIGUSR2', open)
process.on('SIGTERM', stop)
process.on('SIGINT', stop)
open()
