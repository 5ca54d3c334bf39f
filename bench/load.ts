// `npm run load`: the API under load, against a server that is already running (it starts nothing itself).
//   EVENHAND_LOAD_URL=http://127.0.0.1:3000 NUXT_DB_PORT=3306 npm run load   (after `npm start` in another shell)
// Loopback only. Bounded: each scenario runs LOAD_SECONDS (default 60) and then stops.
// (a) saturation: 200-note attempts from 100 connections as fast as the server answers (autocannon);
//     attempts/s, p50/p99, errors, and rows stored (counted in the database before and after) against 201s.
// (b) open loop: 50 attempts/s on a fixed schedule whatever the replies' pace, with class progress and
//     attempt-list reads mixed in; p50/p99 per route, measured from the moment each request was due.
// The demo students sign in (password evenhand-demo); a per-student rate limit shows as 429s, counted apart.
// Figures only, nothing asserted: on a shared machine they are noisy.
import { randomUUID } from 'node:crypto'
import autocannon from 'autocannon'
import knex from 'knex'
import { Note } from 'tonal'
import config from '../knexfile'
import type { DrillNote } from '../shared/types/drill'
import type { PlayedEvent } from '../shared/types/attempt'

const base = process.env.EVENHAND_LOAD_URL
if (!base) {
  console.error('Set EVENHAND_LOAD_URL to a running server, e.g. start `npm start` in one shell and run\n'
    + '  EVENHAND_LOAD_URL=http://127.0.0.1:3000 npm run load\n'
    + 'with the same NUXT_DB_* / DB_PORT as that server, so stored rows can be counted. LOAD_SECONDS shortens each scenario.')
  process.exit(2)
}
const url = new URL(base)
if (!['127.0.0.1', 'localhost', '[::1]'].includes(url.hostname)) {
  console.error(`load tests run against loopback only, not ${url.hostname}`)
  process.exit(2)
}
const SECONDS = Math.min(600, Math.max(1, Number(process.env.LOAD_SECONDS ?? 60)))
// `a`, `b` or both (default): one scenario alone, e.g. while profiling the server.
const SCENARIOS = process.env.LOAD_SCENARIOS ?? 'ab'
const NOTES = 200
const PASSWORD = 'evenhand-demo'
const STUDENTS = ['student', 'theo', 'ada', 'samir', 'lucia', 'jonah'].map(n => `${n}@evenhand.test`)

async function signIn(email: string, password: string): Promise<string> {
  const res = await fetch(new URL('/api/auth/login', url), { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password }) })
  if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status}`)
  return res.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
}

async function getJson<T>(path: string, cookie: string): Promise<T> {
  const res = await fetch(new URL(path, url), { headers: { cookie, accept: 'application/json' } })
  if (!res.ok) throw new Error(`GET ${path}: ${res.status}`)
  return await res.json() as T
}

interface Player { cookie: string, drillId: number, version: number, bpm: number, eventsJson: string }

/** Each student's first drill, played as a 200-note attempt (the drill's notes repeated, as a student practising it over and over). */
async function player(email: string): Promise<Player> {
  const cookie = await signIn(email, PASSWORD)
  const { drills } = await getJson<{ drills: { id: number }[] }>('/api/drills', cookie)
  if (!drills.length) throw new Error(`${email} sees no drill`)
  const { drill } = await getJson<{ drill: { id: number, version: number, tempoBpm: number, notes: DrillNote[] } }>(`/api/drills/${drills[0]!.id}`, cookie)
  return { cookie, drillId: drill.id, version: drill.version, bpm: drill.tempoBpm, eventsJson: JSON.stringify(playedEvents(drill.notes, drill.tempoBpm)) }
}

function playedEvents(notes: DrillNote[], bpm: number): PlayedEvent[] {
  const beatMs = 60_000 / bpm
  const span = Math.max(...notes.map(n => n.beat + n.length))
  const events: PlayedEvent[] = []
  for (let i = 0; i < NOTES; i++) {
    const n = notes[i % notes.length]!
    const beat = Math.floor(i / notes.length) * span + n.beat
    const midi = Note.midi(n.pitch)!
    events.push({ note: midi, on: true, velocity: 60 + (i % 20), timeMs: beat * beatMs + (i % 7) }, { note: midi, on: false, timeMs: (beat + n.length * 0.9) * beatMs })
  }
  return events.sort((a, b) => a.timeMs - b.timeMs)
}

/**
 * A new attempt (fresh id, started now) with the player's performance, written once per player: the load tool
 * shares the machine's two cores with the server, and building 400 events for every request cost it about 1 ms
 * of CPU a request (now 0.3 ms), a fifth of what the server spends saving one.
 */
function attemptBody(p: Player): string {
  const head = JSON.stringify({ id: randomUUID(), drillId: p.drillId, drillVersion: p.version, startedAt: new Date().toISOString(), tempoBpm: p.bpm, inputDevice: 'midi' })
  return `${head.slice(0, -1)},"events":${p.eventsJson}}`
}

function pct(sorted: number[], p: number): number {
  return sorted.length ? sorted[Math.min(sorted.length - 1, Math.ceil(p * sorted.length) - 1)]! : NaN
}

const db = knex(config)
const countAttempts = async () => Number((await db('attempts').count({ n: '*' }))[0]!.n)

try {
  const players = await Promise.all(STUDENTS.map(player))
  const teacher = await signIn('teacher@evenhand.test', PASSWORD)
  const { classes } = await getJson<{ classes: { id: number }[] }>('/api/classes', teacher)
  console.log(`load against ${url.origin}, ${SECONDS} s per scenario, ${players.length} students, ${NOTES}-note attempts (shared machine: figures are noisy)\n`)

  if (SCENARIOS.includes('a')) await saturation(players)
  if (SCENARIOS.includes('b')) await openLoop(players, teacher, classes)
}
finally {
  await db.destroy()
}

async function saturation(players: Player[]): Promise<void> {
  const before = await countAttempts()
  let turn = 0
  const result = await autocannon({
    url: url.origin,
    connections: 100,
    duration: SECONDS,
    requests: [{
      method: 'POST',
      path: '/api/attempts',
      setupRequest: (req) => {
        const p = players[turn++ % players.length]!
        return { ...req, headers: { 'content-type': 'application/json', 'cookie': p.cookie }, body: attemptBody(p) }
      },
    }],
  })
  // autocannon drops the requests still in flight when time is up; the server finishes and stores them anyway.
  await new Promise(r => setTimeout(r, 5000))
  const stored = await countAttempts() - before
  const codes = result.statusCodeStats as Record<string, { count: number }>
  const acknowledged = codes['201']?.count ?? 0
  const limited = codes['429']?.count ?? 0
  console.log('(a) saturation: POST /api/attempts, 100 connections')
  console.table([{
    'attempts/s': +(acknowledged / SECONDS).toFixed(1),
    'p50 ms': result.latency.p50,
    'p99 ms': result.latency.p99,
    'HTTP 201': acknowledged,
    'HTTP 429': limited,
    'other non-2xx': result.non2xx - limited,
    'errors/timeouts': result.errors + result.timeouts,
    'rows stored': stored,
    // Never below 0 (a lost attempt); at most the 100 requests cut off in flight at the end.
    'stored - 201 (cut off in flight)': stored - acknowledged,
  }])
}

/** (b) open loop: requests leave on schedule, whether or not earlier ones have answered. */
async function openLoop(players: Player[], teacher: string, classes: { id: number }[]): Promise<void> {
  const RATE = 50
  const routes: { name: string, every: number, send: (i: number) => Promise<Response> }[] = [
    { name: 'POST /api/attempts', every: 1, send: (i) => {
      const p = players[i % players.length]!
      return fetch(new URL('/api/attempts', url), { method: 'POST', headers: { 'content-type': 'application/json', 'cookie': p.cookie }, body: attemptBody(p) })
    } },
    { name: 'GET /api/attempts', every: 2, send: i => fetch(new URL('/api/attempts', url), { headers: { cookie: players[i % players.length]!.cookie, accept: 'application/json' } }) },
    { name: 'GET /api/classes/:id/progress', every: 5, send: i => fetch(new URL(`/api/classes/${classes[i % Math.max(1, classes.length)]?.id ?? 0}/progress`, url), { headers: { cookie: teacher, accept: 'application/json' } }) },
  ]
  const samples = new Map(routes.map(r => [r.name, { ms: [] as number[], codes: {} as Record<string, number> }]))
  const start = performance.now()
  const pending: Promise<void>[] = []
  const total = RATE * SECONDS
  for (let i = 0; i < total; i++) {
    const due = start + i * 1000 / RATE
    const wait = due - performance.now()
    if (wait > 0) await new Promise(r => setTimeout(r, wait))
    for (const route of routes) {
      if (i % route.every) continue
      const s = samples.get(route.name)!
      pending.push(route.send(i).then(async (res) => {
        await res.arrayBuffer()
        s.codes[res.status] = (s.codes[res.status] ?? 0) + 1
      }, () => {
        s.codes.error = (s.codes.error ?? 0) + 1
      }).then(() => {
        s.ms.push(performance.now() - due)
      }))
    }
  }
  await Promise.all(pending)
  console.log(`\n(b) open loop: ${RATE} attempts/s with reads mixed in`)
  console.table(routes.map((r) => {
    const s = samples.get(r.name)!
    const sorted = s.ms.sort((a, b) => a - b)
    return { 'route': r.name, 'requests/s': +(RATE / r.every).toFixed(1), 'p50 ms': Math.round(pct(sorted, 0.5)), 'p99 ms': Math.round(pct(sorted, 0.99)), 'statuses': JSON.stringify(s.codes) }
  }))
}
