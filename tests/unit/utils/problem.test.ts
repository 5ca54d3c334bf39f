import { describe, expect, it } from 'vitest'
import { describeProblem, problemStatus } from '../../../utils/problem'

describe('describeProblem', () => {
  it.each([
    [404, 'missing'],
    [403, 'forbidden'],
    [401, 'signed-out'],
    [500, 'fault'],
    [503, 'fault'],
    [undefined, 'offline'],
  ] as const)('tells status %s apart as %s', (status, kind) => {
    expect(describeProblem(status, 'drill').kind).toBe(kind)
  })

  it('names the thing the page shows', () => {
    expect(describeProblem(404, 'attempt').title).toBe('This attempt isn\'t here')
  })

  it('reads a failure as no connection when the browser says it is offline, whatever the status', () => {
    expect(describeProblem(500, 'page', false).kind).toBe('offline')
    expect(describeProblem(404, 'page', false).kind).toBe('missing')
  })
})

describe('problemStatus', () => {
  it('reads the status of a fetch error and of a Nuxt error', () => {
    expect(problemStatus({ statusCode: 404 })).toBe(404)
    expect(problemStatus({ status: 502 })).toBe(502)
  })

  it('has no status for a request that never got an answer', () => {
    expect(problemStatus(new TypeError('fetch failed'))).toBeUndefined()
    expect(problemStatus({ statusCode: 0 })).toBeUndefined()
    expect(problemStatus(null)).toBeUndefined()
  })
})
