// Rate limits held in MariaDB (rate-limiter-flexible's MySQL store on our Knex pool), so every app
// instance counts against the same numbers. A limit reached is a 429 with Retry-After.
import type { H3Event } from 'h3'
import { RateLimiterMySQL, RateLimiterRes } from 'rate-limiter-flexible'

export type LimitName = 'signInIp' | 'signInAccount' | 'signUpIp' | 'joinCode' | 'attempts' | 'forgotIp' | 'forgotAddress'

const TABLE = 'rate_limits'

interface StoredCount { points: number, expire: number | null }
type Upsert = (key: string, points: number, msDuration: number, forceExpire?: boolean) => Promise<StoredCount[]>
/** The library's own store method, which this class replaces for plain spends. */
const libraryUpsert = (RateLimiterMySQL.prototype as unknown as { _upsert: Upsert })._upsert

/**
 * rate-limiter-flexible's MySQL store spends points in a transaction of four statements (BEGIN, an upsert, a
 * SELECT of the new count, COMMIT): four round trips to MariaDB, with the key's row locked throughout. This
 * store spends them in one statement, the same upsert, which hands the new count back through
 * `LAST_INSERT_ID(expr)`: MariaDB returns that value as the statement's insert id (MariaDB manual,
 * "LAST_INSERT_ID"), while a first spend inserts the row and its count is the points spent. The window's end
 * is then known when the window starts with this spend, and read only when the key is refused (its
 * Retry-After); an accepted spend in a running window reports none (`msBeforeNext` -1), which nothing reads.
 * Anything else the library asks of its store (block, set, a negative spend) keeps its own transaction.
 */
class OneStatementLimiter extends RateLimiterMySQL {
  async _upsert(key: string, points: number, msDuration: number, forceExpire = false): Promise<StoredCount[]> {
    if (forceExpire || points <= 0) return await libraryUpsert.call(this, key, points, msDuration, forceExpire)
    const db = useDb()
    const now = Date.now()
    const expire = msDuration > 0 ? now + msDuration : null
    const [reply] = await db.raw(`INSERT INTO ?? (\`key\`, points, expire) VALUES (?, ?, ?)
      ON DUPLICATE KEY UPDATE points = LAST_INSERT_ID(IF(expire <= ?, ?, points + ?)), expire = IF(expire <= ?, ?, expire)`,
    [TABLE, key, points, expire, now, points, points, now, expire])
    const { affectedRows, insertId } = reply as { affectedRows: number, insertId: number }
    // 1: inserted; 2: updated (the count always changes, so never 0 or 1 for an existing row).
    const count = affectedRows === 1 ? points : insertId
    if (count > this.points || !(count >= points)) {
      const row = await db(TABLE).where('key', key).first('points', 'expire')
      if (row) return [{ points: Number(row.points), expire: row.expire == null ? null : Number(row.expire) }]
    }
    return [{ points: count, expire: count === points ? expire : null }]
  }
}

const limiters = new Map<LimitName, RateLimiterMySQL>()

function limiter(name: LimitName): RateLimiterMySQL {
  let found = limiters.get(name)
  if (!found) {
    const { limits, db } = useRuntimeConfig()
    const spec: Record<LimitName, { points: number, duration: number }> = {
      signInIp: { points: Number(limits.signInFailuresPerIp), duration: Number(limits.signInWindowSeconds) },
      signInAccount: { points: Number(limits.signInFailuresPerAccount), duration: Number(limits.signInWindowSeconds) },
      signUpIp: { points: Number(limits.signUpsPerIpPerHour), duration: 3600 },
      joinCode: { points: Number(limits.joinCodeFailuresPerAccount), duration: Number(limits.signInWindowSeconds) },
      attempts: { points: Number(limits.attemptsPerStudentPerMinute), duration: 60 },
      forgotIp: { points: Number(limits.forgotPerIpPerHour), duration: 3600 },
      forgotAddress: { points: Number(limits.forgotPerAddressPerHour), duration: 3600 },
    }
    found = new OneStatementLimiter({
      storeClient: useDb(),
      storeType: 'knex',
      dbName: String(db.database),
      tableName: TABLE,
      tableCreated: true,
      keyPrefix: name,
      ...spec[name],
    })
    limiters.set(name, found)
  }
  return found
}

/** The client's address as this server saw it (no proxy header is trusted). */
export function clientIp(event: H3Event): string {
  return getRequestIP(event) ?? 'unknown'
}

function tooMany(event: H3Event, msBeforeNext: number, message: string): Error {
  setResponseHeader(event, 'retry-after', Math.max(1, Math.ceil(msBeforeNext / 1000)))
  return createError({ statusCode: 429, statusMessage: 'Too many requests', message })
}

/** Throws a 429 when `key` has used up `name`'s points, without spending any. */
export async function refuseWhenSpent(event: H3Event, name: LimitName, key: string, message: string): Promise<void> {
  const l = limiter(name)
  const state = await l.get(key)
  if (state && state.consumedPoints >= l.points) throw tooMany(event, state.msBeforeNext, message)
}

/** Spends one point of `name` for `key`; throws a 429 when none was left. */
export async function spend(event: H3Event, name: LimitName, key: string, message: string): Promise<void> {
  try {
    await limiter(name).consume(key)
  }
  catch (error) {
    if (error instanceof RateLimiterRes) throw tooMany(event, error.msBeforeNext, message)
    throw error
  }
}

/** Spends one point without refusing: the next request is the one refused. */
export async function spendQuietly(event: H3Event, name: LimitName, key: string): Promise<void> {
  await limiter(name).consume(key).catch((error: unknown) => {
    if (!(error instanceof RateLimiterRes)) throw error
  })
}

export async function forget(event: H3Event, name: LimitName, key: string): Promise<void> {
  await limiter(name).delete(key)
}
