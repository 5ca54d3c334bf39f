// Sends the outbox from inside the server: every few seconds this instance claims due messages and
// sends them (server/utils/mail.ts). Every instance runs one; the claims keep them from sending a message twice.
import { createMailTransport, deliverDue, newWorkerId } from '../utils/mail'

export default defineNitroPlugin((nitroApp) => {
  const { smtp, mail } = useRuntimeConfig()
  if (!Number(mail.pollMs)) return
  const transport = createMailTransport(smtp)
  const workerId = newWorkerId()
  const retry = { baseMs: Number(mail.retryBaseMs), maxMs: Number(mail.retryMaxMs) }
  let busy = false
  const timer = setInterval(async () => {
    if (busy) return
    busy = true
    try {
      await deliverDue(useDb(), transport, { workerId, from: smtp.from, retry })
    }
    catch (error) {
      // The database may be away for a moment; the next tick tries again.
      console.error('[mail] outbox round failed:', (error as Error).message)
    }
    finally {
      busy = false
    }
  }, Number(mail.pollMs))
  timer.unref()
  nitroApp.hooks.hook('close', () => {
    clearInterval(timer)
    transport.close()
  })
})
