import type { H3Error } from 'h3'

/**
 * Blanks the stack of the error and of its causes (their first line repeats the message, which may hold data).
 * h3's createError makes `stack` a getter onto the wrapped error's own, which cannot be assigned: assigning
 * it threw inside this hook, and the request was never answered. The wrapped error's own stack can be.
 */
function forgetStacks(error: unknown): void {
  let current = error as { stack?: unknown, cause?: unknown } | undefined
  for (let depth = 0; current && typeof current === 'object' && depth < 5; depth++) {
    try {
      current.stack = undefined
    }
    catch { /* a getter onto a cause's stack, blanked on the next round */ }
    current = current.cause as typeof current
  }
}

// A database that does not answer is a 503 the client may retry after a pause (the attempt outbox does);
// any database error is logged by its code alone, since its message holds the statement and request data.
export default defineNitroPlugin((nitroApp) => {
  nitroApp.hooks.hook('error', (error, { event }) => {
    const failure = databaseFailure(error)
    if (!failure) return
    const h3Error = error as H3Error
    console.error(`[database] ${event ? `${event.method} ${routePath(event)}: ` : ''}${failure.summary}`)
    forgetStacks(h3Error)
    h3Error.cause = undefined
    h3Error.message = failure.unreachable ? 'The database is not answering; try again shortly' : 'The database refused the change'
    if (failure.unreachable) {
      h3Error.statusCode = 503
      h3Error.statusMessage = 'Service unavailable'
      h3Error.unhandled = false
      if (event) setResponseHeader(event, 'retry-after', Number(useRuntimeConfig().limits.retryAfterSeconds))
    }
    else {
      // Logged above by code; the default handler would print the whole error again.
      h3Error.unhandled = false
      h3Error.message = 'Server error'
    }
  })
})
