// MariaDB's errors carry the statement and its bindings (a whole attempt's events); none of that may reach a log.

/** Codes of a database that does not answer, as opposed to one that refuses a statement. */
const UNREACHABLE = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EHOSTUNREACH', 'ENOTFOUND', 'EPIPE',
  'PROTOCOL_CONNECTION_LOST', 'ER_CON_COUNT_ERROR', 'ER_SERVER_SHUTDOWN', 'ER_CONNECTION_KILLED'])

interface DbErrorLike { code?: unknown, errno?: unknown, sqlMessage?: unknown, sql?: unknown, name?: unknown, message?: unknown, cause?: unknown }

function causes(error: unknown): DbErrorLike[] {
  const list: DbErrorLike[] = []
  let current = error as DbErrorLike | undefined
  while (current && typeof current === 'object' && list.length < 5) {
    list.push(current)
    current = current.cause as DbErrorLike | undefined
  }
  return list
}

export interface DatabaseFailure {
  unreachable: boolean
  /** What may be logged: the error's code, never its statement. */
  summary: string
}

export function databaseFailure(error: unknown): DatabaseFailure | null {
  for (const e of causes(error)) {
    if (e.name === 'KnexTimeoutError') return { unreachable: true, summary: 'KnexTimeoutError: no connection within the pool timeout' }
    if (typeof e.code === 'string' && (UNREACHABLE.has(e.code) || 'sqlMessage' in e || 'sql' in e || typeof e.errno === 'number')) {
      return { unreachable: UNREACHABLE.has(e.code), summary: `${e.code}${typeof e.errno === 'number' ? ` (${e.errno})` : ''}` }
    }
  }
  return null
}
