// Who may call what: every route under server/api × seven callers, each with the status the product rules give
// (tests/support/route-table.ts), against the built server and MariaDB. A route file without a row fails here.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { Client, closeTestDb } from '../support/server'
import { makeAccount } from '../support/accounts'
import { CALLERS, MORE_CASES, ROUTES, World, apiRoutes, send, type Caller, type RouteRow } from '../support/route-table'

afterAll(closeTestDb)

describe('the access matrix', () => {
  let world: World
  beforeAll(async () => {
    world = await World.build()
  })

  it('has a row for every route file and no row without one', () => {
    const routes = apiRoutes()
    // The tree itself: a broken walk would make every other check here vacuous.
    expect(routes).toContain('POST /api/attempts')
    expect(routes).toContain('DELETE /api/classes/[id]/students/[studentId]')
    expect(routes.filter(r => !(r in ROUTES)), 'routes without a row in tests/support/route-table.ts').toEqual([])
    expect(Object.keys(ROUTES).filter(r => !routes.includes(r)), 'rows without a route file').toEqual([])
  })

  /** Each caller in turn; the statuses they got, and where a list showed or hid the marked row wrongly. */
  async function run(route: string, row: RouteRow): Promise<void> {
    const got: Partial<Record<Caller, number>> = {}
    const leaks: string[] = []
    for (const caller of CALLERS) {
      const client = row.session ? await world.freshClient(caller) : world.client(caller)
      const res = await send(client, route, await row.request(world))
      got[caller] = res.status
      if (row.session === 'ends') await world.renewClient(caller)
      if (row.shows && res.status < 300) {
        const holds = JSON.stringify(res.body).includes(row.shows.text(world))
        if (holds !== row.shows.to.includes(caller)) leaks.push(`${caller} ${holds ? 'sees' : 'misses'} it`)
      }
    }
    expect(got).toEqual(Object.fromEntries(CALLERS.map((caller, i) => [caller, row.expect[i]])))
    expect(leaks).toEqual([])
  }

  for (const route of apiRoutes()) {
    const row = ROUTES[route]
    if (row) it(`${route}: ${row.expect.join(' ')}`, () => run(route, row))
  }

  for (const { route, label, row } of MORE_CASES) {
    it(`${route}, ${label}: ${row.expect.join(' ')}`, async () => {
      expect(apiRoutes()).toContain(route)
      await run(route, row)
    })
  }

  it('opens the local mail box to the seed\'s own accounts, not to anyone who signs up on their domain', async () => {
    const demo = await new Client().signIn('teacher@evenhand.test')
    expect((await demo.get('/api/dev/mail')).status).toBe(200)
    for (const role of ['teacher', 'student'] as const) {
      const lookalike = await makeAccount(role, 'Lookalike', 'evenhand.test')
      expect((await lookalike.client.get('/api/dev/mail')).status).toBe(403)
      expect((await lookalike.client.get(`/api/dev/mail/${world.mailId}`)).status).toBe(403)
    }
  })
})
