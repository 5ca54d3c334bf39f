// Class progress aggregated in MariaDB and attempt lists paged on the server, on a studio with a heavy
// history: the figures equal what the earlier code computed from every attempt, and paging returns every
// attempt exactly once, newest first.
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { closeTestDb, testDb } from '../support/server'
import type { Client } from '../support/server'
import { attemptBody, attemptRowCopier, type DrillReply } from '../support/attempts'
import { newClass, newStudent, newTeacher, publicDrillIds } from '../support/studio'

afterAll(closeTestDb)

interface Cell { assigned: boolean, attempts: number, best: number | null, latest: number | null, trend: number | null, overdue: boolean }
interface Progress { students: { id: number }[], drills: { id: number }[], cells: Record<string, Record<string, Cell>> }
interface Summary { id: string, studentId: number, drillId: number, startedAt: string, score: number }
interface Page { attempts: Summary[], nextCursor: string | null }

const DAY_MS = 86_400_000

/** A small deterministic generator (mulberry32), so a failure can be replayed. */
function random(seed: number): () => number {
  let a = seed
  return () => {
    a = (a + 0x6D2B79F5) | 0
    let t = Math.imul(a ^ (a >>> 15), 1 | a)
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

/** The cell as the earlier code computed it: every attempt's score read in start order, then counted in JavaScript. */
function cellFromEveryAttempt(scores: number[]): Omit<Cell, 'assigned' | 'overdue'> {
  const before = scores.slice(-5, -1)
  return {
    attempts: scores.length,
    best: scores.length ? Math.max(...scores) : null,
    latest: scores.at(-1) ?? null,
    trend: before.length ? scores.at(-1)! - before.reduce((x, y) => x + y, 0) / before.length : null,
  }
}

let teacher: Client
let classId: number
let students: { client: Client, id: number }[]
let drills: number[]
/** Every attempt of the fixture, as stored. */
let stored: { id: string, student_id: number, drill_id: number, started_at: Date, score: number }[]

async function pages(client: Client, query: string, limit: number): Promise<{ pages: Page[], ids: string[] }> {
  const all: Page[] = []
  let cursor: string | null = null
  do {
    const res: { status: number, body: Page } = await client.get<Page>(`/api/attempts?${query}&limit=${limit}${cursor ? `&cursor=${encodeURIComponent(cursor)}` : ''}`)
    expect(res.status).toBe(200)
    all.push(res.body)
    cursor = res.body.nextCursor
  } while (cursor && all.length < 1000)
  return { pages: all, ids: all.flatMap(p => p.attempts.map(a => a.id)) }
}

beforeAll(async () => {
  teacher = await newTeacher('Paging Teacher')
  const cls = await newClass(teacher, 'Heavy practice')
  classId = cls.id
  students = [await newStudent(cls.joinCode, 'Ines Heavy'), await newStudent(cls.joinCode, 'Jon Light'), await newStudent(cls.joinCode, 'Kai Once')]
  drills = (await publicDrillIds()).slice(0, 3)
  const set = await teacher.post('/api/drill-sets', { title: 'Paging set', items: drills.map(drillId => ({ drillId, targetScore: 80 })) })
  const due = new Date(Date.now() + 7 * DAY_MS).toISOString().slice(0, 10)
  expect((await teacher.post('/api/assignments', { drillSetId: set.body.id, classId, dueOn: due, timeZone: 'UTC' })).status).toBe(201)

  // One attempt saved through the API gives rows their real events and result.
  const drill = (await students[0]!.client.get<DrillReply>(`/api/drills/${drills[0]}`)).body
  const first = await students[0]!.client.post('/api/attempts', attemptBody(drill))
  expect(first.status).toBe(201)
  const row = await testDb()('attempts').where({ id: (first.body.attempt as { id: string }).id }).first()
  const template = (await attemptRowCopier(testDb()))(row)

  // Ines played 1,500 times over three weeks, Jon 60, Kai once; some attempts share a start to the millisecond.
  const next = random(20261203)
  const plan: [number, number][] = [[0, 1500], [1, 60], [2, 1]]
  const start = Date.now() - 21 * DAY_MS
  const rows = []
  for (const [who, count] of plan) {
    let previous = start
    for (let n = 0; n < count; n++) {
      const at = next() < 0.05 ? previous : start + Math.floor(next() * 21 * DAY_MS)
      previous = at
      const drillId = who === 2 ? drills[1]! : drills[Math.floor(next() * drills.length)]!
      rows.push({ ...template, id: randomUUID(), student_id: students[who]!.id, drill_id: drillId, started_at: new Date(at), score: Math.floor(next() * 101), created_at: new Date() })
    }
  }
  for (let i = 0; i < rows.length; i += 200) await testDb()('attempts').insert(rows.slice(i, i + 200))
  stored = (await testDb()('attempts').whereIn('student_id', students.map(s => s.id)).select('id', 'student_id', 'drill_id', 'started_at', 'score'))
    .map(r => ({ ...r, student_id: Number(r.student_id), drill_id: Number(r.drill_id), score: Number(r.score) }))
}, 120_000)

/** Newest first by start, ties by id descending (as MariaDB's collation orders these lowercase ids). */
function newestFirst(a: { started_at: Date, id: string }, b: { started_at: Date, id: string }): number {
  return b.started_at.getTime() - a.started_at.getTime() || (a.id < b.id ? 1 : a.id > b.id ? -1 : 0)
}

describe('class progress from SQL aggregates', () => {
  it('equals the figures computed from every attempt, cell by cell', async () => {
    const res = await teacher.get<Progress>(`/api/classes/${classId}/progress`)
    expect(res.status).toBe(200)
    expect(res.body.students.map(s => s.id).sort()).toEqual(students.map(s => s.id).sort())
    expect(res.body.drills.map(d => d.id).sort()).toEqual([...drills].sort())
    const seen = { trends: 0, empty: 0, single: 0 }
    for (const s of students) {
      for (const d of drills) {
        const scores = stored.filter(a => a.student_id === s.id && a.drill_id === d)
          .sort((a, b) => -newestFirst(a, b)).map(a => a.score)
        const want = cellFromEveryAttempt(scores)
        const cell = res.body.cells[s.id]![d]!
        expect({ attempts: cell.attempts, best: cell.best, latest: cell.latest, trend: cell.trend }).toEqual(want)
        expect(cell.assigned).toBe(true)
        // Due next week: nothing is overdue yet.
        expect(cell.overdue).toBe(false)
        if (want.trend !== null) seen.trends++
        if (want.attempts === 0) seen.empty++
        if (want.attempts === 1) seen.single++
      }
    }
    // The fixture holds cells with a trend, cells never played and a cell played once (no trend).
    expect(seen.trends).toBeGreaterThanOrEqual(6)
    expect(seen.empty).toBe(2)
    expect(seen.single).toBe(1)
  })

  it('gives the same CSV figures as the JSON', async () => {
    const json = await teacher.get<Progress>(`/api/classes/${classId}/progress`)
    const csv = await teacher.request('GET', `/api/classes/${classId}/progress.csv`)
    const lines = String(csv.body).trimEnd().split('\r\n').slice(1)
    const ines = students[0]!.id
    const heavy = json.body.cells[ines]!
    const inesLines = lines.filter(l => l.includes('Ines Heavy'))
    expect(inesLines.map(l => l.split(',').slice(-5, -2).map(Number))).toEqual(drills.map(d => [heavy[d]!.attempts, heavy[d]!.best, heavy[d]!.latest]))
  })
})

describe('attempt lists paged on the server', () => {
  it('gives the teacher every attempt of a heavy student exactly once, newest first, page by page', async () => {
    const ines = students[0]!.id
    const { pages: all, ids } = await pages(teacher, `student=${ines}`, 97)
    const want = stored.filter(a => a.student_id === ines).sort(newestFirst).map(a => a.id)
    expect(want.length).toBe(1501)
    expect(ids).toEqual(want)
    expect(all.slice(0, -1).every(p => p.attempts.length === 97)).toBe(true)
    expect(all.at(-1)!.nextCursor).toBeNull()
  })

  it('pages a student\'s own list of one drill, and a page boundary inside attempts started in the same millisecond skips none', async () => {
    const ines = students[0]!
    const want = stored.filter(a => a.student_id === ines.id && a.drill_id === drills[2]).sort(newestFirst).map(a => a.id)
    // Small pages put boundaries in many places, between attempts started in the same millisecond among them.
    for (const limit of [2, 7]) {
      const { ids } = await pages(ines.client, `drill=${drills[2]}`, limit)
      expect(ids).toEqual(want)
    }
  })

  it('neither repeats nor skips an older attempt when a new one is saved between pages', async () => {
    const jon = students[1]!
    const want = stored.filter(a => a.student_id === jon.id).sort(newestFirst).map(a => a.id)
    const first = await jon.client.get<Page>('/api/attempts?limit=25')
    const drill = (await jon.client.get<DrillReply>(`/api/drills/${drills[0]}`)).body
    const fresh = await jon.client.post('/api/attempts', attemptBody(drill))
    expect(fresh.status).toBe(201)
    let ids = first.body.attempts.map(a => a.id)
    let cursor = first.body.nextCursor
    while (cursor) {
      const page = await jon.client.get<Page>(`/api/attempts?limit=25&cursor=${encodeURIComponent(cursor)}`)
      ids = [...ids, ...page.body.attempts.map(a => a.id)]
      cursor = page.body.nextCursor
    }
    expect(ids).toEqual(want)
    // The new attempt heads a fresh first page.
    expect((await jon.client.get<Page>('/api/attempts?limit=1')).body.attempts[0]!.id).toBe((fresh.body.attempt as { id: string }).id)
    await testDb()('attempts').where({ id: (fresh.body.attempt as { id: string }).id }).delete()
  })

  it.each([
    ['limit=0', /^limit:/],
    ['limit=101', /^limit:/],
    ['limit=abc', /^limit:/],
    ['cursor=yesterday', /^cursor:/],
    ['cursor=2026-12-01T10:00:00.000Z_not-a-uuid', /^cursor:/],
    [`cursor=2040-01-01T00:00:00.000Z_${randomUUID()}`, /^cursor:/],
    [`cursor=${'x'.repeat(500)}`, /^cursor:/],
    ['drill=99999999999999999999', /^drill:/],
  ])('answers 400 naming the field for %s', async (query, field) => {
    const res = await teacher.get(`/api/attempts?${query}`)
    expect(res.status).toBe(400)
    expect(String(res.body.message)).toMatch(field)
  })
})
