// The drill library route for one teacher with 500 drills (made through POST /api/drills, so every row
// and version is as the editor leaves it; 50 of them archived), timed on the test stack's server with
// its search, filters and orders. Goal: p95 under 50 ms. Figures only: the machine is shared.
import { nameFromMidi } from '../shared/engine'
import { DrillKind } from '../shared/types/drill'
import { hashPassword } from '../scripts/lib/password'
import { Client, closeTestDb, testDb } from '../tests/support/server'
import { ROUTE_RUNS, ROUTE_WARM_UP, timeRoute } from './routes'

const DRILLS = 500
const ARCHIVED = 50
const HANDS = ['right', 'left', 'both'] as const

/** Drill k: a run of 8 to 39 notes from its own starting key, in the hand and kind its number picks. */
function drillBody(k: number): Record<string, unknown> {
  const hand = HANDS[k % HANDS.length]!
  const kind = DrillKind.options[k % DrillKind.options.length]!
  const start = hand === 'left' ? 43 + (k % 12) : 57 + (k % 12)
  const length = 8 + (k % 32)
  const line = (from: number): string => Array.from({ length }, (_, i) => nameFromMidi(from + [0, 2, 4, 5, 7, 9, 11][i % 7]! + 12 * Math.floor(i / 7) - 12 * Math.floor(i / 14))).join(' ')
  const notation = hand === 'both' ? `RH ${line(start + 12)}\nLH ${line(start - 12)}` : line(start)
  return { title: `${kind} drill ${k + 1} for week ${1 + (k % 30)}`, hand, tempoBpm: 60 + (k % 80), level: 1 + (k % 8), kind, tags: [`week ${1 + (k % 30)}`, k % 2 ? 'legato' : 'staccato'], notation }
}

async function benchTeacher(): Promise<Client> {
  const email = `bench-library-${Date.now()}@evenhand.test`
  await testDb()('users').insert({ email, name: 'Bench Teacher', role: 'teacher', password_hash: await hashPassword('bench-password-1') })
  const client = await new Client().signIn(email, 'bench-password-1')
  const started = performance.now()
  for (let k = 0; k < DRILLS; k++) {
    const res = await client.post<{ drill: { id: number } }>('/api/drills', drillBody(k))
    if (res.status !== 201) throw new Error(`drill ${k + 1}: ${res.status} ${JSON.stringify(res.body)}`)
    if (k < ARCHIVED) await client.post(`/api/drills/${res.body.drill.id}/archive`)
  }
  console.log(`bench teacher: ${DRILLS} drills made through POST /api/drills in ${((performance.now() - started) / 1000).toFixed(1)} s, ${ARCHIVED} archived`)
  return client
}

export async function benchLibraryRoute(): Promise<void> {
  const client = await benchTeacher()
  console.log(`the drill library route, ${ROUTE_RUNS} sequential requests each after ${ROUTE_WARM_UP} to warm up:`)
  await timeRoute(client, '/api/drills')
  await timeRoute(client, '/api/drills?sort=title')
  await timeRoute(client, '/api/drills?q=week%2012')
  await timeRoute(client, '/api/drills?hand=left&level=3&kind=scale')
  await timeRoute(client, '/api/drills?archived=true')
  await closeTestDb()
}

if (import.meta.url === `file://${process.argv[1]}`) await benchLibraryRoute()
