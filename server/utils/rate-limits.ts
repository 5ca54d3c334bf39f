// Rate limits held in MariaDB (rate-limiter-flexible's MySQL store on our Knex pool), so every app
// instance counts against the same numbers. A limit reached is a 429 with Retry-After.
import type { H3Event } from 'h3'
import { RateLimiterMySQL, RateLimiterRes } from 'rate-limiter-flexible'

export type LimitName = 'signInIp' | 'signInAccount' | 'signUpIp' | 'joinCode' | 'attempts' | 'forgotIp' | 'forgotAddress'

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
    found = new RateLimiterMySQL({
      storeClient: useDb(),
      storeType: 'knex',
      dbName: String(db.database),
      tableName: 'rate_limits',
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
