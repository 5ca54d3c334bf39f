// The progress, habits, MIDI export and comment read-state routes, each checked against figures the
// test recomputes itself from the stored attempts (simple-statistics for the means).
import { randomUUID } from 'node:crypto'
import { parseMidi } from 'midi-file'
import { mean } from 'simple-statistics'
import { afterAll, describe, expect, it } from 'vitest'
import type { DrillProgress, HabitsView, ProgressOverview, StudentAttemptsPage } from '../../shared/types/progress'
import { TZDate } from '@date-fns/tz'
import { hashPassword } from '../../scripts/lib/password'
import { addDays } from '../../shared/utils/localDays'
import { attemptRowCopier } from '../support/attempts'
import { Client, closeTestDb, testDb } from '../support/server'

afterAll(closeTestDb)

const DAY_MS = 86_400_000

async function studentId(email: string): Promise<number> {
  return Number((await testDb()('users').where({ email }).first('id')).id)
}

/** The drill Noor played most, so the series has many points. */
async function busiestDrill(id: number): Promise<number> {
  const row = await testDb()('attempts').where('student_id', id).groupBy('drill_id').orderByRaw('COUNT(*) DESC').first('drill_id')
  return Number(row.drill_id)
}

function parsed<T>(value: unknown): T {
  return (typeof value === 'string' ? JSON.parse(value) : value) as T
}

interface StoredResult {
  timing: { sdMs: number | null, deviationsMs: (number | null)[] }
  loudness: { sd: number | null, velocities: (number | null)[] }
  positionChanges: { planned: number, played: number, at: number[], plannedAt: number[] }
  tempo: { playedBpm: number | null }
  inferredFingers: { finger: number | null }[]
}

describe('a student\'s progress on one drill', () => {
  it('gives one point per stored attempt with the stored figures, the summary and a least-squares trend', async () => {
    const noor = await studentId('student@evenhand.test')
    const drill = await busiestDrill(noor)
    const student = await new Client().signIn('student@evenhand.test')
    const res = await student.get<DrillProgress>(`/api/me/progress?drill=${drill}`)
    expect(res.status).toBe(200)
    const stored = await testDb()('attempts').where({ student_id: noor, drill_id: drill }).orderBy('started_at')
    expect(res.body.points.map(p => p.attemptId)).toEqual(stored.map(a => a.id))
    stored.forEach((a, k) => {
      const r = parsed<StoredResult>(a.result)
      const p = res.body.points[k]!
      expect(p.score).toBe(a.score)
      expect(p.timingSdMs).toBeCloseTo(r.timing.sdMs!, 6)
      expect(p.velocitySd).toBeCloseTo(r.loudness.sd!, 6)
      expect(p.positionsPlayed).toBe(r.positionChanges.played)
      expect(p.positionsPlanned).toBe(r.positionChanges.planned)
      expect(p.playedBpm).toBeCloseTo(r.tempo.playedBpm!, 6)
      // One beat is 60,000 / bpm ms.
      expect(p.timingBeatPercent).toBeCloseTo(100 * r.timing.sdMs! / (60_000 / r.tempo.playedBpm!), 6)
    })
    const scores = stored.map(a => a.score as number)
    expect(res.body.summary.attempts).toBe(stored.length)
    expect(res.body.summary.best).toBe(Math.max(...scores))
    expect(res.body.summary.mean).toBeCloseTo(mean(scores), 3)
    // Least squares by hand: slope = Σ(x−x̄)(y−ȳ) / Σ(x−x̄)², x in days.
    const xs = stored.map(a => new Date(a.started_at).getTime() / DAY_MS)
    const mx = mean(xs)
    const my = mean(scores)
    const slope = xs.reduce((s, x, i) => s + (x - mx) * (scores[i]! - my), 0) / xs.reduce((s, x) => s + (x - mx) ** 2, 0)
    expect(res.body.trends.score!.perWeek).toBeCloseTo(slope * 7, 6)
    expect(res.body.trends.score!.to.value).toBeCloseTo(my + slope * (xs.at(-1)! - mx), 6)
    const item = await testDb()('assignments as a').join('drill_set_items as i', 'i.drill_set_id', 'a.drill_set_id')
      .where('i.drill_id', drill)
      .where(q => q.where('a.student_id', noor).orWhereIn('a.class_id', testDb()('class_members').where('student_id', noor).select('class_id')))
      .orderBy('a.due_at', 'desc').first('i.target_tempo_bpm', 'i.target_score')
    expect(res.body.target).toEqual({ score: item.target_score, tempoBpm: item.target_tempo_bpm })
  })

  it('keeps to the chosen range', async () => {
    const noor = await studentId('student@evenhand.test')
    const drill = await busiestDrill(noor)
    const student = await new Client().signIn('student@evenhand.test')
    const res = await student.get<DrillProgress>(`/api/me/progress?drill=${drill}&range=2w`)
    expect(res.status).toBe(200)
    const recent = await testDb()('attempts').where({ student_id: noor, drill_id: drill }).where('started_at', '>=', new Date(Date.now() - 14 * DAY_MS)).count({ n: '*' })
    const all = await testDb()('attempts').where({ student_id: noor, drill_id: drill }).count({ n: '*' })
    expect(res.body.points).toHaveLength(Number(recent[0]!.n))
    expect(Number(recent[0]!.n)).toBeLessThan(Number(all[0]!.n))
  })

  it('refuses a bad query with the field named', async () => {
    const student = await new Client().signIn('student@evenhand.test')
    const bad = await student.get('/api/me/progress?drill=abc')
    expect(bad.status).toBe(400)
    expect(String(bad.body.message)).toMatch(/^drill:/)
    const range = await student.get('/api/me/progress?drill=1&range=year')
    expect(range.status).toBe(400)
    expect(String(range.body.message)).toMatch(/^range:/)
    expect((await student.get('/api/me/progress?tz=100000')).status).toBe(400)
    expect((await student.get('/api/me/progress?drill=999999')).status).toBe(404)
  })
})

describe('a student\'s overview and practice log', () => {
  it('gives every drill played with best and latest, minutes per day from the events, and the run of days', async () => {
    const noor = await studentId('student@evenhand.test')
    const student = await new Client().signIn('student@evenhand.test')
    const res = await student.get<ProgressOverview>('/api/me/progress?tz=0')
    expect(res.status).toBe(200)
    const stored = await testDb()('attempts').where('student_id', noor).orderBy(['started_at', 'id'])
    const byDrill = new Map<number, typeof stored>()
    for (const a of stored) byDrill.set(Number(a.drill_id), [...(byDrill.get(Number(a.drill_id)) ?? []), a])
    expect(res.body.drills.map(d => d.drillId).sort()).toEqual([...byDrill.keys()].sort())
    for (const d of res.body.drills) {
      const list = byDrill.get(d.drillId)!
      expect(d.attempts).toBe(list.length)
      expect(d.best).toBe(Math.max(...list.map(a => a.score)))
      expect(d.latest).toBe(list.at(-1).score)
      expect(d.latestBpm).toBeCloseTo(parsed<StoredResult>(list.at(-1).result).tempo.playedBpm!, 6)
    }
    const minutes = new Map<string, number>()
    for (const a of stored) {
      const events = parsed<{ timeMs: number }[]>(a.events)
      // An attempt with no events (one the fuzzer stored) lasted no time.
      const ms = events.length ? Math.max(0, events.at(-1)!.timeMs - Math.min(0, events[0]!.timeMs)) : 0
      const day = new Date(a.started_at).toISOString().slice(0, 10)
      minutes.set(day, (minutes.get(day) ?? 0) + ms / 60_000)
    }
    expect(res.body.log).toHaveLength(56)
    expect(res.body.log.at(-1)!.day).toBe(new Date().toISOString().slice(0, 10))
    let checked = 0
    for (const d of res.body.log) {
      expect(d.minutes).toBeCloseTo(minutes.get(d.day) ?? 0, 1)
      if (minutes.has(d.day)) checked++
    }
    expect(checked).toBeGreaterThan(5)
    let streak = 0
    const today = new Date().toISOString().slice(0, 10)
    for (let k = minutes.has(today) ? 0 : 1; minutes.has(new Date(Date.now() - k * DAY_MS).toISOString().slice(0, 10)); k++) streak++
    expect(res.body.streak).toBe(streak)
  })
})

describe('practice days in the student\'s own time zone', () => {
  it('counts an attempt at 23:30 in Los Angeles on that evening for the student and the teacher, whatever offset a page sends', async () => {
    const zone = 'America/Los_Angeles'
    const stamp = Date.now()
    // A studio of its own (a teacher, a class, one student), so other tests' class tables stay as they are.
    const teacher = new Client()
    const teacherEmail = `late-teacher-${stamp}@evenhand.test`
    expect((await teacher.post('/api/auth/register', { name: 'Late Teacher', email: teacherEmail, password: 'long-enough-1' })).status).toBeLessThan(300)
    const teacherId = (await testDb()('users').where({ email: teacherEmail }).first('id')).id
    const email = `late-evening-${stamp}@evenhand.test`
    const [id] = await testDb()('users').insert({ email, name: 'Late Evening', role: 'student', password_hash: await hashPassword('late-evening-1') })
    const [classId] = await testDb()('classes').insert({ teacher_id: teacherId, name: 'Evening class', join_code: `LATE${String(stamp).slice(-8)}` })
    await testDb()('class_members').insert({ class_id: classId, student_id: id })
    // The browser names its zone in a cookie; signing in keeps it on the account.
    const student = new Client()
    expect((await student.request('POST', '/api/auth/login', { email, password: 'late-evening-1' }, undefined, { cookie: 'evenhand_tz=America/Los_Angeles' })).status).toBe(200)
    expect((await testDb()('users').where({ id }).first('time_zone')).time_zone).toBe(zone)

    // Yesterday at 23:30 on the clock in Los Angeles: already the next day in UTC. The attempt is one of
    // Noor's, copied (without the columns MariaDB derives from it).
    const today = new TZDate(Date.now(), zone)
    const lateEvening = new TZDate(today.getFullYear(), today.getMonth(), today.getDate() - 1, 23, 30, 0, zone)
    const yesterday = `${lateEvening.getFullYear()}-${String(lateEvening.getMonth() + 1).padStart(2, '0')}-${String(lateEvening.getDate()).padStart(2, '0')}`
    expect(new Date(lateEvening.getTime()).toISOString().slice(0, 10)).not.toBe(yesterday)
    const source = await testDb()('attempts').where('student_id', await studentId('student@evenhand.test')).first('drill_id', 'drill_version', 'tempo_bpm', 'input_device', 'events', 'score', 'result', 'engine_version')
    await testDb()('attempts').insert({ ...(await attemptRowCopier(testDb()))(source), id: randomUUID(), student_id: id, started_at: new Date(lateEvening.getTime()) })

    for (const [who, path] of [['student', '/api/me/progress?tz=0'], ['teacher', `/api/students/${id}/progress?tz=60`]] as const) {
      const res = await (who === 'student' ? student : teacher).get<ProgressOverview>(path)
      expect(res.status, who).toBe(200)
      const practised = res.body.log.filter(d => d.attempts > 0)
      expect(practised.map(d => d.day), who).toEqual([yesterday])
      expect(res.body.log.at(-1)!.day, who).toBe(addDays(yesterday, 1))
      // Today is not over, so yesterday's practice is a run of one day.
      expect(res.body.streak, who).toBe(1)
    }
  })
})

// The habits read a student's latest 300 attempts (DEVELOPERS.md); other test files may have added to Noor's.
const latestAttempts = (student: number) => testDb()('attempts').where('student_id', student)
  .orderBy([{ column: 'started_at', order: 'desc' }, { column: 'id', order: 'desc' }]).limit(300)

describe('habits across drills', () => {
  it('gives per finger the mean difference from the other fingers and how often it was late, early, loud or soft', async () => {
    const noor = await studentId('student@evenhand.test')
    const student = await new Client().signIn('student@evenhand.test')
    const res = await student.get<HabitsView>(`/api/students/${noor}/habits?range=all`)
    expect(res.status).toBe(200)
    const stored = await latestAttempts(noor)
    expect(res.body.attempts).toBe(stored.length)
    for (const h of res.body.fingers) {
      const velocity: number[] = []
      const timing: number[] = []
      for (const a of stored) {
        const r = parsed<StoredResult>(a.result)
        const split = (values: (number | null)[]): number | null => {
          const own = values.filter((v, i) => v !== null && r.inferredFingers[i]?.finger === h.finger) as number[]
          const rest = values.filter((v, i) => v !== null && r.inferredFingers[i]?.finger != null && r.inferredFingers[i]?.finger !== h.finger) as number[]
          return own.length && rest.length ? mean(own) - mean(rest) : null
        }
        const v = split(r.loudness.velocities)
        if (v !== null) velocity.push(v)
        const t = split(r.timing.deviationsMs)
        if (t !== null) timing.push(t)
      }
      expect(h.velocity).toBeCloseTo(mean(velocity), 6)
      expect(h.timingMs).toBeCloseTo(mean(timing), 6)
      expect(h.loud).toBe(velocity.filter(v => v > 5).length)
      expect(h.soft).toBe(velocity.filter(v => v < -5).length)
      expect(h.late).toBe(timing.filter(v => v > 10).length)
      expect(h.early).toBe(timing.filter(v => v < -10).length)
    }
    // The demo's Noor leans on her thumb (seeds/demo/studio.ts): the statement says so in words.
    const thumb = res.body.fingers.find(f => f.finger === 1)!
    expect(thumb.statement).toMatch(new RegExp(`^Your thumb is on average ${Math.round(thumb.velocity!)} velocity units louder than your other fingers over ${thumb.attempts} attempts\\.$`))
    const teacher = await new Client().signIn('teacher@evenhand.test')
    const seen = await teacher.get<HabitsView>(`/api/students/${noor}/habits?range=all`)
    expect(seen.body.fingers[0]!.statement).toMatch(/^Noor's thumb is on average/)
  })

  it('names the places where the hand moved and the plan did not, most frequent first', async () => {
    const noor = await studentId('student@evenhand.test')
    const student = await new Client().signIn('student@evenhand.test')
    const res = await student.get<HabitsView>(`/api/students/${noor}/habits?range=all`)
    const stored = await latestAttempts(noor)
    const counts = new Map<string, number>()
    for (const a of stored) {
      const r = parsed<StoredResult>(a.result)
      for (const i of r.positionChanges.at) {
        if (!r.positionChanges.plannedAt.includes(i)) counts.set(`${a.drill_id}:${i}`, (counts.get(`${a.drill_id}:${i}`) ?? 0) + 1)
      }
    }
    const top = Math.max(...counts.values())
    expect(res.body.shifts.length).toBeGreaterThan(0)
    expect(res.body.shifts[0]!.times).toBe(top)
    for (const s of res.body.shifts) expect(counts.get(`${s.drillId}:${s.noteIndex}`)).toBe(s.times)
  })
})

describe('who may see a student\'s progress', () => {
  it('lets the student and their teacher in, marks the reply private, and keeps other students and teachers out', async () => {
    const noor = await studentId('student@evenhand.test')
    const drill = await busiestDrill(noor)
    const routes = [`/api/students/${noor}/progress`, `/api/students/${noor}/progress?drill=${drill}`, `/api/students/${noor}/habits`, `/api/students/${noor}/attempts`]
    const own = await new Client().signIn('student@evenhand.test')
    const teacher = await new Client().signIn('teacher@evenhand.test')
    const otherStudent = await new Client().signIn('theo@evenhand.test')
    const otherTeacher = new Client()
    await otherTeacher.post('/api/auth/register', { name: 'Other Teacher', email: `other-p-${Date.now()}@evenhand.test`, password: 'long-enough-1' })
    for (const path of routes) {
      const mine = await own.get(path)
      expect(mine.status, path).toBe(200)
      // One student's record: no shared cache may keep it.
      expect(mine.headers.get('cache-control'), path).toBe('private, no-store')
      expect((await teacher.get(path)).status, path).toBe(200)
      expect((await otherStudent.get(path)).status, path).toBe(403)
      expect((await otherTeacher.get(path)).status, path).toBe(403)
      expect((await new Client().get(path)).status, path).toBe(401)
    }
    expect((await teacher.get('/api/me/progress')).status).toBe(403)
    expect((await teacher.get('/api/students/abc/habits')).status).toBe(400)
    expect((await teacher.get('/api/students/99999999/habits')).status).toBe(404)
  })
})

describe('a student\'s attempts, a page at a time', () => {
  it('gives the teacher each page newest first with its drill and comment count, and keeps everyone else out', async () => {
    const noor = await studentId('student@evenhand.test')
    const teacher = await new Client().signIn('teacher@evenhand.test')
    const stored = await testDb()('attempts as a').join('drills as d', 'd.id', 'a.drill_id').where('a.student_id', noor)
      .orderBy([{ column: 'a.started_at', order: 'desc' }, { column: 'a.id', order: 'desc' }]).select('a.id', 'a.score', 'd.title')
    const comments = await testDb()('comments').whereIn('attempt_id', stored.map(a => a.id)).groupBy('attempt_id').select('attempt_id', testDb().raw('COUNT(*) AS n'))
    const commentCount = new Map(comments.map(c => [String(c.attempt_id), Number(c.n)]))
    expect(stored.length).toBeGreaterThan(40)
    const seen: string[] = []
    for (const page of [1, 2, 3]) {
      const res = await teacher.get<StudentAttemptsPage>(`/api/students/${noor}/attempts?page=${page}`)
      expect(res.status).toBe(200)
      expect(res.body.total).toBe(stored.length)
      expect(res.body.page).toBe(page)
      const expected = stored.slice((page - 1) * res.body.perPage, page * res.body.perPage)
      expect(res.body.attempts.map(a => a.id)).toEqual(expected.map(a => a.id))
      expect(res.body.attempts.map(a => a.drillTitle)).toEqual(expected.map(a => a.title))
      expect(res.body.attempts.map(a => a.score)).toEqual(expected.map(a => a.score))
      expect(res.body.attempts.map(a => a.comments)).toEqual(expected.map(a => commentCount.get(a.id) ?? 0))
      seen.push(...res.body.attempts.map(a => a.id))
    }
    expect(new Set(seen).size).toBe(seen.length)
    const past = await teacher.get<StudentAttemptsPage>(`/api/students/${noor}/attempts?page=1000`)
    expect(past.body.attempts).toEqual([])
    expect((await teacher.get(`/api/students/${noor}/attempts?page=0`)).status).toBe(400)
    const bad = await teacher.get(`/api/students/${noor}/attempts?page=two`)
    expect(bad.status).toBe(400)
    expect(String(bad.body.message)).toMatch(/^page:/)
    const otherTeacher = new Client()
    await otherTeacher.post('/api/auth/register', { name: 'Other Teacher', email: `other-a-${Date.now()}@evenhand.test`, password: 'long-enough-1' })
    expect((await otherTeacher.get(`/api/students/${noor}/attempts`)).status).toBe(403)
    expect((await (await new Client().signIn('theo@evenhand.test')).get(`/api/students/${noor}/attempts`)).status).toBe(403)
    expect((await (await new Client().signIn('student@evenhand.test')).get(`/api/students/${noor}/attempts`)).status).toBe(200)
    expect((await new Client().get(`/api/students/${noor}/attempts`)).status).toBe(401)
  })
})

describe('an attempt as a Standard MIDI File', () => {
  it('holds the played notes, velocities and times within one tick, read back by midi-file', async () => {
    const noor = await studentId('student@evenhand.test')
    const a = await testDb()('attempts').where('student_id', noor).orderBy('started_at', 'desc').first()
    const student = await new Client().signIn('student@evenhand.test')
    const res = await student.get<Uint8Array>(`/api/attempts/${a.id}/export.mid`)
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toBe('audio/midi')
    const midi = parseMidi(res.body)
    // SMF 1.0: a tempo meta event gives µs per quarter note; note-on with velocity 0 is a note-off.
    const ppq = midi.header.ticksPerBeat!
    const events = parsed<{ note: number, on: boolean, velocity?: number, timeMs: number }[]>(a.events)
    const bpm = Number(a.tempo_bpm)
    const origin = Math.min(0, ...events.map(e => e.timeMs))
    const ons: { note: number, velocity: number, tick: number }[] = []
    for (const track of midi.tracks) {
      let tick = 0
      for (const e of track) {
        tick += e.deltaTime
        if (e.type === 'noteOn' && e.velocity > 0) ons.push({ note: e.noteNumber, velocity: e.velocity, tick })
      }
    }
    const played = events.filter(e => e.on)
    expect(ons.map(o => o.note)).toEqual(played.map(e => e.note))
    played.forEach((e, k) => {
      expect(ons[k]!.velocity).toBe(e.velocity)
      expect(Math.abs(ons[k]!.tick - (e.timeMs - origin) * bpm * ppq / 60_000)).toBeLessThanOrEqual(1)
    })
    const outsider = await new Client().signIn('theo@evenhand.test')
    expect((await outsider.get(`/api/attempts/${a.id}/export.mid`)).status).toBe(404)
  })
})

describe('new comments', () => {
  it('count as unread for the student until the attempt is opened', async () => {
    const noor = await studentId('student@evenhand.test')
    const a = await testDb()('attempts').where('student_id', noor).orderBy('started_at').first('id')
    const teacher = await new Client().signIn('teacher@evenhand.test')
    const body = `Lighter thumb on the turn ${Date.now()}`
    expect((await teacher.post(`/api/attempts/${a.id}/comments`, { body })).status).toBe(201)
    const student = await new Client().signIn('student@evenhand.test')
    const before = await student.get<{ unread: number, comments: { body: string, unread: boolean, attemptId: string }[] }>('/api/me/comments')
    const mine = before.body.comments.find(c => c.body === body)!
    expect(mine.unread).toBe(true)
    expect(mine.attemptId).toBe(a.id)
    const unreadStored = await testDb()('comments as c').join('attempts as t', 't.id', 'c.attempt_id').where('t.student_id', noor).whereNull('c.read_at').count({ n: '*' })
    expect(before.body.unread).toBe(Number(unreadStored[0]!.n))
    // Another student or the teacher opening it changes nothing.
    expect((await new Client().signIn('theo@evenhand.test').then(c => c.post(`/api/attempts/${a.id}/comments/read`))).status).toBe(404)
    expect((await teacher.post(`/api/attempts/${a.id}/comments/read`)).status).toBe(403)
    expect((await student.post(`/api/attempts/${a.id}/comments/read`)).status).toBe(200)
    const after = await student.get<{ unread: number, comments: { body: string, unread: boolean }[] }>('/api/me/comments')
    expect(after.body.comments.find(c => c.body === body)!.unread).toBe(false)
    expect(after.body.unread).toBe(before.body.unread - 1)
  })
})
