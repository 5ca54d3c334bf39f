import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest'
import type { EffectScope } from 'vue'
import { readBody, setResponseStatus } from 'h3'
import type { H3Event } from 'h3'
import { registerEndpoint } from '@nuxt/test-utils/runtime'
import type { AttemptInput } from '#shared/types/attempt'
import { createAttemptOutbox, retryDelayMs } from '~/composables/useAttemptOutbox'
import type { AttemptOutbox } from '~/composables/useAttemptOutbox'

// The mocked POST /api/attempts: records what it received, answers as `respond` says, with
// errors in the shape Nitro gives them ({ statusCode, message }).
let respond: (attempt: AttemptInput) => { status: number, message?: string } = () => ({ status: 201 })
let received: AttemptInput[] = []
let unregister: () => void

beforeAll(() => {
  unregister = registerEndpoint('/api/attempts', {
    method: 'POST',
    handler: async (event: H3Event) => {
      const attempt = await readBody<AttemptInput>(event)
      received.push(attempt)
      const { status, message } = respond(attempt)
      setResponseStatus(event, status)
      return status >= 400 ? { statusCode: status, message } : { attempt: { id: attempt.id, score: 87, result: {} } }
    },
  })
})
afterAll(() => unregister())

const scopes: EffectScope[] = []
function visit(): AttemptOutbox {
  const scope = effectScope()
  scopes.push(scope)
  return scope.run(() => createAttemptOutbox())!
}

function attempt(id: string): AttemptInput {
  return {
    id,
    drillId: 3,
    drillVersion: 1,
    assignmentId: null,
    startedAt: '2026-12-01T10:00:00.000Z',
    tempoBpm: 80,
    inputDevice: 'midi',
    events: [{ note: 60, on: true, velocity: 70, timeMs: 0 }, { note: 60, on: false, velocity: 0, timeMs: 400 }],
  }
}

const A = '6f1c2a52-8d0e-4c4e-9b7a-1f2d3c4b5a60'
const B = '0b5e7d2c-3a41-4f6b-8c9d-2e1f0a3b4c5d'

function stored(): string[] {
  return Object.keys(localStorage).filter(k => k.startsWith('evenhand.outbox.')).sort()
}

beforeEach(() => {
  localStorage.clear()
  received = []
  respond = () => ({ status: 201 })
  useState('nuxt-session').value = { user: { id: 5, email: 'ada@evenhand.test', name: 'Ada', role: 'student' } }
})
afterEach(() => {
  scopes.splice(0).forEach(s => s.stop())
  vi.unstubAllGlobals()
})

describe('useAttemptOutbox', () => {
  it('sends an attempt and forgets it once the server has it', async () => {
    const outbox = visit()
    const outcome = await outbox.save(attempt(A))
    expect(outcome).toEqual({ status: 'sent', attempt: { id: A, score: 87, result: {} } })
    expect(received.map(a => a.id)).toEqual([A])
    expect(stored()).toEqual([])
    expect(outbox.state.value).toBe('idle')
  })

  it('keeps an attempt the server could not take and sends it once on the next flush', async () => {
    respond = () => ({ status: 503, message: 'Database is restarting' })
    const outbox = visit()
    const outcome = await outbox.save(attempt(A))
    expect(outcome).toEqual({ status: 'queued', message: 'Database is restarting' })
    expect(stored()).toEqual([`evenhand.outbox.${A}`])
    expect(outbox.pending.value.map(e => [e.attempt.id, e.tries])).toEqual([[A, 1]])
    expect(outbox.state.value).toBe('waiting')
    expect(outbox.lastError.value).toBe('Database is restarting')

    respond = () => ({ status: 201 })
    await outbox.flush()
    expect(received.map(a => a.id)).toEqual([A, A])
    expect(outbox.pending.value).toEqual([])
    expect(stored()).toEqual([])
    await outbox.flush()
    expect(received).toHaveLength(2)
  })

  it('tries again by itself after a back-off', async () => {
    vi.useFakeTimers({ toFake: ['setTimeout', 'clearTimeout', 'Date'] })
    try {
      respond = () => ({ status: 502 })
      const outbox = visit()
      await outbox.save(attempt(A))
      respond = () => ({ status: 201 })
      await vi.advanceTimersByTimeAsync(1_500)
      expect(received).toHaveLength(1)
      await vi.advanceTimersByTimeAsync(600)
      await vi.waitFor(() => expect(outbox.pending.value).toEqual([]))
      expect(received).toHaveLength(2)
    }
    finally {
      vi.useRealTimers()
    }
  })

  it('keeps an attempt through a network failure and a reload, and sends it on the next visit', async () => {
    vi.stubGlobal('$fetch', vi.fn().mockRejectedValue(new TypeError('Failed to fetch')))
    const offline = await visit().save(attempt(A))
    expect(offline.status).toBe('queued')
    expect(offline.status === 'queued' && offline.message).toContain('No connection')
    vi.unstubAllGlobals()

    const next = visit()
    expect(next.pending.value.map(e => e.attempt.id)).toEqual([A])
    await next.flush()
    expect(received.map(a => a.id)).toEqual([A])
    expect(stored()).toEqual([])
  })

  it('sets aside an attempt the server refuses and does not send it again', async () => {
    respond = () => ({ status: 400, message: 'events: too many events' })
    const outbox = visit()
    const outcome = await outbox.save(attempt(A))
    expect(outcome).toEqual({ status: 'rejected', message: 'events: too many events' })
    expect(outbox.pending.value).toEqual([])
    expect(outbox.rejected.value.map(e => e.rejected)).toEqual([{ status: 400, message: 'events: too many events' }])

    await outbox.flush()
    expect(received).toHaveLength(1)
    outbox.discard(A)
    expect(stored()).toEqual([])
  })

  it('keeps retrying while signed out instead of setting the attempt aside', async () => {
    respond = () => ({ status: 401 })
    const outbox = visit()
    const outcome = await outbox.save(attempt(A))
    expect(outcome.status).toBe('queued')
    expect(outbox.rejected.value).toEqual([])
    expect(outbox.lastError.value).toContain('signed out')
  })

  it('keeps attempts over a sign-out and sends them only for their own student', async () => {
    respond = () => ({ status: 503 })
    const outbox = visit()
    await outbox.save(attempt(A))
    respond = () => ({ status: 201 })

    useState('nuxt-session').value = null
    await nextTick()
    expect(stored()).toEqual([`evenhand.outbox.${A}`])

    useState('nuxt-session').value = { user: { id: 6, email: 'bo@evenhand.test', name: 'Bo', role: 'student' } }
    await outbox.flush()
    expect(received).toHaveLength(1)
    expect(outbox.pending.value).toEqual([])

    useState('nuxt-session').value = { user: { id: 5, email: 'ada@evenhand.test', name: 'Ada', role: 'student' } }
    await vi.waitFor(() => expect(received).toHaveLength(2))
    await vi.waitFor(() => expect(stored()).toEqual([]))
  })

  it('never sends an attempt played while signed out as whoever signs in next; it waits to be claimed or discarded', async () => {
    useState('nuxt-session').value = null
    const outbox = visit()
    const outcome = await outbox.save(attempt(A))
    expect(outcome.status).toBe('queued')
    await outbox.save(attempt(B))

    useState('nuxt-session').value = { user: { id: 6, email: 'bo@evenhand.test', name: 'Bo', role: 'student' } }
    await nextTick()
    await outbox.flush()
    expect(received).toEqual([])
    expect(outbox.pending.value).toEqual([])
    expect(outbox.unclaimed.value.map(e => e.attempt.id).sort()).toEqual([B, A].sort())

    await outbox.claim(A)
    expect(received.map(a => a.id)).toEqual([A])
    outbox.discard(B)
    expect(stored()).toEqual([])
    expect(() => outbox.discard(A)).toThrow(/signed out/)
  })

  it('shows a refused attempt with the server’s reason until the student discards it', async () => {
    respond = () => ({ status: 400, message: 'drillVersion: This version of the drill does not exist' })
    const outbox = visit()
    await outbox.save(attempt(A))
    expect(outbox.rejected.value.map(e => [e.attempt.id, e.rejected?.message])).toEqual([[A, 'drillVersion: This version of the drill does not exist']])
    outbox.discard(A)
    expect(outbox.rejected.value).toEqual([])
    expect(stored()).toEqual([])
  })

  it('sends what is waiting when the browser comes back online', async () => {
    respond = () => ({ status: 503 })
    const outbox = visit()
    await outbox.save(attempt(A))
    await outbox.save(attempt(B))
    respond = () => ({ status: 201 })
    window.dispatchEvent(new Event('online'))
    await vi.waitFor(() => expect(outbox.pending.value).toEqual([]))
    expect(received.slice(2).map(a => a.id).sort()).toEqual([A, B].sort())
  })

  it('refuses an attempt that does not fit the schema, saying why', async () => {
    await expect(visit().save({ ...attempt(A), tempoBpm: 999 })).rejects.toThrow(/tempoBpm/)
    expect(stored()).toEqual([])
  })
})

describe('retryDelayMs', () => {
  it.each([[1, 2_000], [2, 4_000], [5, 32_000], [20, 300_000]])('waits after %i tries %i ms', (tries, ms) => {
    expect(retryDelayMs(tries)).toBe(ms)
  })
})
