import { describe, expect, it } from 'vitest'
import { DEFAULT_RETRY, isPermanentFailure, retryDelayMs } from '../../../server/utils/mail'

describe('the outbox retry policy', () => {
  it('doubles the wait after each failure, from the base', () => {
    const policy = { baseMs: 1000, maxMs: 60_000 }
    expect([1, 2, 3, 4, 5].map(n => retryDelayMs(n, policy))).toEqual([1000, 2000, 4000, 8000, 16_000])
  })

  it('never waits longer than the cap, however many failures', () => {
    const policy = { baseMs: 1000, maxMs: 60_000 }
    expect(retryDelayMs(7, policy)).toBe(60_000)
    expect(retryDelayMs(10_000, policy)).toBe(60_000)
  })

  it('waits 30 s after the first failure and at most an hour by default', () => {
    expect(retryDelayMs(1)).toBe(30_000)
    expect(retryDelayMs(8)).toBe(DEFAULT_RETRY.maxMs)
    expect(DEFAULT_RETRY.maxMs).toBe(3_600_000)
  })

  it('sends a message that never failed at once', () => {
    expect(retryDelayMs(0)).toBe(0)
  })

  // SMTP reply classes (RFC 5321, section 4.2.1): 4yz is a transient failure, 5yz a permanent one.
  it('calls only 5xx replies permanent; a refused connection or a 4xx is worth retrying', () => {
    expect(isPermanentFailure(Object.assign(new Error('mailbox unavailable'), { responseCode: 550 }))).toBe(true)
    expect(isPermanentFailure(Object.assign(new Error('try later'), { responseCode: 451 }))).toBe(false)
    expect(isPermanentFailure(Object.assign(new Error('connect ECONNREFUSED'), { code: 'ESOCKET' }))).toBe(false)
  })
})
