import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest'
import { setResponseStatus } from 'h3'
import type { H3Event } from 'h3'
import { registerEndpoint } from '@nuxt/test-utils/runtime'
import { useStudioAction } from '~/composables/useStudioAction'

// A stand-in for the routes a teacher deletes through (an invitation here): records the method of each request it
// receives and answers 204, or a 409 with Nitro's error shape while `refuse` is set.
const deleted: string[] = []
let refuse = false
let unregister: () => void
beforeAll(() => {
  unregister = registerEndpoint('/api/invitations/41', {
    method: 'DELETE',
    handler: (event: H3Event) => {
      deleted.push(event.method)
      if (refuse) {
        setResponseStatus(event, 409)
        return { statusCode: 409, message: 'This invitation was accepted already' }
      }
      setResponseStatus(event, 204)
      return null
    },
  })
})
afterAll(() => unregister())
afterEach(() => {
  deleted.length = 0
  refuse = false
  vi.unstubAllGlobals()
})

/** The teacher's answer to the browser's confirm dialog. */
function answer(yes: boolean) {
  const ask = vi.fn((_question?: string) => yes)
  vi.stubGlobal('confirm', ask)
  return ask
}

describe('useStudioAction().removeAfterAsking', () => {
  it('asks first and deletes nothing when the teacher says no', async () => {
    const ask = answer(false)
    const done = vi.fn()
    await useStudioAction(done).removeAfterAsking('/api/invitations/41', 'Withdraw the invitation?')
    expect(ask).toHaveBeenCalledWith('Withdraw the invitation?')
    expect([deleted, done.mock.calls.length]).toEqual([[], 0])
  })

  it('deletes once on yes, then refreshes', async () => {
    answer(true)
    const done = vi.fn()
    const action = useStudioAction(done)
    await action.removeAfterAsking('/api/invitations/41', 'Withdraw the invitation?')
    expect([deleted, done.mock.calls.length, action.error.value, action.busy.value]).toEqual([['DELETE'], 1, '', false])
  })

  it('keeps the server\'s reason when the delete is refused, and does not refresh', async () => {
    answer(true)
    refuse = true
    const done = vi.fn()
    const action = useStudioAction(done)
    await action.removeAfterAsking('/api/invitations/41', 'Withdraw the invitation?')
    expect([deleted.length, done.mock.calls.length, action.error.value]).toEqual([1, 0, 'This invitation was accepted already'])
  })
})
