// Hostile input on every route (fast-check): each route's working request from tests/support/route-table.ts,
// changed at one to three places (tests/support/hostile.ts), sent by a caller the route is meant for. Never a 5xx,
// no table changed by a refused request, and nothing of the request in the server's log.
// FUZZ_SEED reproduces a run (the seed is printed with any failure); FUZZ_RUNS sets the runs per route.
import { existsSync, readFileSync, statSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import fc from 'fast-check'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Client} from '../support/server';
import { closeTestDb, testDb } from '../support/server'
import { CALLERS, ROUTES, World, apiRoutes, methodOf, type Caller, type RouteRow } from '../support/route-table'
import { MARKER, applyMutations, mutations, type HostileRequest, type Mutation } from '../support/hostile'

const SEED = Number(process.env.FUZZ_SEED ?? Math.floor(Math.random() * 2 ** 31))
const RUNS = Number(process.env.FUZZ_RUNS ?? 10)
const LOG = fileURLToPath(new URL('../../.data/test-server.log', import.meta.url))
/** Written by every request or by the app on its own: sessions seen, limits spent, mail sent (their rows are counted instead). */
const BUSY_TABLES = new Set(['sessions', 'rate_limits', 'mail_outbox', 'knex_migrations', 'knex_migrations_lock'])

afterAll(closeTestDb)

/** The caller the route is for: anonymous where anyone may call it alike, else the first one it answers 2xx. */
function callerFor(row: RouteRow): Caller {
  if (row.expect[0] < 300 || new Set(row.expect).size === 1) return 'anonymous'
  const order: Caller[] = ['owner', 'ownStudent', 'admin', 'otherTeacher', 'classmate', 'otherStudent']
  return order.find(c => row.expect[CALLERS.indexOf(c)]! < 300) ?? 'owner'
}

/** What a refused request must leave as it was: every table's checksum, and how many sessions and queued e-mails there are. */
async function checksums(tables: string[]): Promise<string> {
  const db = testDb()
  const [[rows], sessions, mail] = await Promise.all([
    db.raw(`CHECKSUM TABLE ${tables.map(t => `\`${t}\``).join(', ')}`),
    db('sessions').count({ n: '*' }),
    db('mail_outbox').count({ n: '*' }),
  ])
  const sums = (rows as { Table: string, Checksum: number }[]).map(r => `${r.Table}=${r.Checksum}`)
  return [...sums, `sessions=${sessions[0]!.n}`, `mail_outbox=${mail[0]!.n}`].join(' ')
}

async function sendHostile(client: Client, route: string, req: HostileRequest): Promise<number> {
  const method = methodOf(route)
  try {
    if (req.upload) return (await client.upload(req.path, req.upload.file, req.upload.fields)).status
    const headers: Record<string, string> = req.contentType === undefined ? {} : { 'content-type': req.contentType }
    const raw = req.raw ?? (req.contentType === undefined || req.body === undefined ? undefined : JSON.stringify(req.body))
    return (await client.request(method, req.path, raw === undefined ? req.body : undefined, raw, headers)).status
  }
  catch (error) {
    // Only a reply counts: a connection the server dropped is as bad as a 500.
    throw new Error(`no reply: ${(error as Error).message}`, { cause: error })
  }
}

function describeRequest(req: HostileRequest): string {
  const body = req.raw ?? JSON.stringify(req.body) ?? ''
  return `${req.path.slice(0, 300)} ${body.length > 400 ? `${body.slice(0, 400)}… (${body.length} characters)` : body}`
}

describe(`hostile input on every route (FUZZ_SEED=${SEED}, ${RUNS} runs per route)`, () => {
  let world: World
  let tables: string[]
  let logStart = 0
  /** Replies by class (2xx, 4xx), to see that the hostile requests reach past the first check. */
  const tally = new Map<string, number>()
  afterAll(() => {
    console.info(`hostile input, FUZZ_SEED=${SEED}: ${[...tally].map(([k, n]) => `${n} × ${k}`).join(', ')}`)
  })
  beforeAll(async () => {
    world = await World.build()
    const [rows] = await testDb().raw('SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE()')
    tables = (rows as { name: string }[]).map(r => r.name).filter(t => !BUSY_TABLES.has(t))
    logStart = existsSync(LOG) ? statSync(LOG).size : 0
  })

  it('has a request for every route file', () => {
    expect(apiRoutes().filter(r => !(r in ROUTES))).toEqual([])
  })

  for (const route of apiRoutes()) {
    const row = ROUTES[route]
    if (!row) continue
    const caller = callerFor(row)
    it(`${route} as ${caller}`, async () => {
      const template = route.split(' ')[1]!
      const sample = await row.request(world)
      // Before the random runs, each field of the body once with a hostile value of its own kind (which one turns with the seed).
      const fields = sample.body && typeof sample.body === 'object' && methodOf(route) !== 'GET' ? Object.keys(sample.body) : []
      const examples: [Mutation[]][] = fields.map((_, i) => [[{ kind: 'field', pick: i, shallow: true, value: null, alike: SEED + i }]])
      const property = fc.asyncProperty(mutations(methodOf(route), Boolean(sample.upload)), async (list) => {
        const client = row.session ? await world.freshClient(caller) : world.client(caller)
        const req = applyMutations(await row.request(world), template, list)
        const before = await checksums(tables)
        const status = await sendHostile(client, route, req)
        tally.set(`${String(status)[0]}xx`, (tally.get(`${String(status)[0]}xx`) ?? 0) + 1)
        if (row.session === 'ends' && status < 300) await world.renewClient(caller)
        if (status >= 500) throw new Error(`${status} for ${describeRequest(req)}`)
        if (status >= 400) {
          const after = await checksums(tables)
          if (after !== before) throw new Error(`refused with ${status}, yet a table changed (${before} → ${after}) for ${describeRequest(req)}`)
        }
      })
      try {
        await fc.assert(property, { seed: SEED, numRuns: RUNS + examples.length, examples, endOnFailure: true })
      }
      catch (error) {
        // fast-check's message holds the whole counterexample, 10,000-character strings and all.
        const message = (error as Error).message
        throw new Error(`${route}: rerun with FUZZ_SEED=${SEED}\n${message.length > 3000 ? `${message.slice(0, 3000)}…` : message}`, { cause: (error as Error).cause })
      }
    })
  }

  it('never wrote a request\'s data or a statement into the server log', () => {
    if (!existsSync(LOG)) throw new Error(`no server log at ${LOG}: run through \`npm test\``)
    const written = readFileSync(LOG).subarray(logStart).toString('utf8')
    expect(written).not.toContain(MARKER)
    expect(written).not.toMatch(/\b(insert into|update `|select .* from|delete from)\b/i)
  })
})
