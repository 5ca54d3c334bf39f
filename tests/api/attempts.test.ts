import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { Client, closeTestDb, testDb } from '../support/server'
import { attemptBody as attemptFor, play, scaleDrill } from '../support/attempts'
import { makeAccount } from '../support/accounts'
import type { DrillReply } from '../support/attempts'
import type { PlayedEvent } from '../../shared/types/attempt'

afterAll(closeTestDb)

interface AttemptReply { attempt: { id: string, score: number, studentId: number, result: { accuracy: { correct: number, missed: number } } } }

let noor: Client
let drill: DrillReply
beforeAll(async () => {
  noor = await new Client().signIn('student@evenhand.test')
  drill = await scaleDrill(noor)
})

function attemptBody(id = randomUUID()): Record<string, unknown> {
  return attemptFor(drill, { id })
}

describe('POST /api/attempts', () => {
  it('grades on the server, stores raw events, and stores one row for a re-sent id', async () => {
    const body = attemptBody()
    const first = await noor.post<AttemptReply>('/api/attempts', body)
    expect(first.status).toBe(201)
    expect(first.body.attempt.result.accuracy.correct).toBe(drill.drill.notes.length)
    expect(first.body.attempt.score).toBeGreaterThan(70)

    const again = await noor.post<AttemptReply>('/api/attempts', body)
    expect(again.status).toBe(200)
    expect(again.body.attempt.id).toBe(body.id)
    const rows = await testDb()('attempts').where({ id: body.id })
    expect(rows).toHaveLength(1)
    const stored = typeof rows[0].events === 'string' ? JSON.parse(rows[0].events) : rows[0].events
    expect(stored).toHaveLength((body.events as unknown[]).length)
    expect(rows[0].score).toBe(first.body.attempt.score)
  })

  it('ignores any score the browser sends and recomputes it', async () => {
    const body = { ...attemptBody(), score: 100, events: [] }
    const res = await noor.post<AttemptReply>('/api/attempts', body)
    expect(res.status).toBe(201)
    expect(res.body.attempt.result.accuracy.missed).toBe(drill.drill.notes.length)
    expect(res.body.attempt.score).toBeLessThan(50)
  })

  it.each([
    ['a bad id', { id: 'nope' }, /^id:/],
    ['a velocity above 127', { events: [{ note: 60, on: true, velocity: 300, timeMs: 0 }] }, /^events\.0\.velocity:/],
    ['an unknown device', { inputDevice: 'theremin' }, /^inputDevice:/],
    ['a missing drill version', { drillVersion: undefined }, /^drillVersion:/],
  ])('rejects %s with 400 and the field name', async (_, change, message) => {
    const res = await noor.post('/api/attempts', { ...attemptBody(), ...change })
    expect(res.status).toBe(400)
    expect(res.body.message).toMatch(message)
  })

  it('grades an attempt of some bars against those bars only, and keeps the part with it', async () => {
    // 4/4 in quavers: bar 2 holds the notes from beat 4, played here as if they began the drill.
    const bar2 = drill.drill.notes.filter(n => n.beat >= 4).map(n => ({ ...n, beat: n.beat - 4 }))
    const id = randomUUID()
    const body = { ...attemptBody(id), events: play(bar2, 72), part: { fromBar: 2, toBar: 2, hand: 'right' } }
    const res = await noor.post<AttemptReply & { attempt: { part: unknown, result: { accuracy: { total: number } } } }>('/api/attempts', body)
    expect(res.status).toBe(201)
    expect(res.body.attempt.result.accuracy).toMatchObject({ correct: bar2.length, total: bar2.length, missed: 0 })
    expect(res.body.attempt.part).toEqual({ fromBar: 2, toBar: 2, hand: 'right' })
    expect((await noor.get<{ attempt: { part: unknown } }>(`/api/attempts/${id}`)).body.attempt.part).toEqual({ fromBar: 2, toBar: 2, hand: 'right' })
  })

  it('drops the velocities of an input that has none and grades without touch', async () => {
    const body = { ...attemptBody(), inputDevice: 'computer-keys' }
    const res = await noor.post<{ attempt: { events: PlayedEvent[], result: { scoreParts: { loudness: { weight: number } } } } }>('/api/attempts', body)
    expect(res.status).toBe(201)
    expect(res.body.attempt.events.filter(e => e.velocity !== undefined)).toEqual([])
    expect(res.body.attempt.result.scoreParts.loudness.weight).toBe(0)
  })

  it.each([
    ['bars in the wrong order', { part: { fromBar: 2, toBar: 1, hand: null } }, /^part\.toBar:/],
    ['bars past the end', { part: { fromBar: 3, toBar: 4, hand: null } }, /^part:/],
    ['an unknown hand', { part: { fromBar: 1, toBar: 1, hand: 'third' } }, /^part\.hand:/],
  ])('rejects a part with %s', async (_, change, message) => {
    const res = await noor.post('/api/attempts', { ...attemptBody(), ...change })
    expect(res.status).toBe(400)
    expect(res.body.message).toMatch(message)
  })

  it('refuses a body over 2 MB with 413 before reading it', async () => {
    const res = await noor.request('POST', '/api/attempts', undefined, JSON.stringify({ ...attemptBody(), deviceName: 'x'.repeat(2_200_000) }))
    expect(res.status).toBe(413)
    expect(res.body.message).toMatch(/^body:/)
  })

  it('refuses another student reusing an attempt id, and hides the attempt from them', async () => {
    const body = attemptBody()
    expect((await noor.post('/api/attempts', body)).status).toBe(201)
    const theo = await new Client().signIn('theo@evenhand.test')
    expect((await theo.get(`/api/attempts/${body.id}`)).status).toBe(404)
    const taken = await theo.post('/api/attempts', { ...body, events: [] })
    expect(taken.status).toBe(409)
    expect(taken.body.message).toMatch(/^id:/)
    const noorId = (await testDb()('users').where({ email: 'student@evenhand.test' }).first('id')).id
    const rows = await testDb()('attempts').where({ id: body.id }).select('student_id', 'score')
    expect(rows).toHaveLength(1)
    expect(Number(rows[0].student_id)).toBe(Number(noorId))
    expect(rows[0].score).toBeGreaterThan(70)
  })

  // The save answers from the values it stored instead of reading the row back: the answer must be the row.
  it.each([
    ['a whole drill played for its assignment', () => ({})],
    ['one bar of one hand, with the pedal, a tempo in hundredths and a device name MariaDB must mend', () => ({
      events: play(drill.drill.notes.filter(n => n.beat >= 4).map(n => ({ ...n, beat: n.beat - 4 })), 71.25),
      part: { fromBar: 2, toBar: 2, hand: 'right' },
      pedal: [{ down: true, timeMs: 5.5 }, { down: false, timeMs: 900 }],
      tempoBpm: 71.25,
      deviceName: '  Stage piano \ud83c ',
    })],
    ['the on-screen keys, no assignment, a start with an offset and microseconds', () => ({
      inputDevice: 'screen',
      assignmentId: null,
      deviceName: undefined,
      startedAt: '2026-12-03T09:15:30.123456+01:00',
      tempoBpm: 60.04,
    })],
  ])('answers %s exactly as the stored attempt reads back', async (_, change) => {
    const id = randomUUID()
    const body = { ...attemptBody(id), ...change() }
    const saved = await noor.post<AttemptReply>('/api/attempts', body)
    expect(saved.status).toBe(201)
    const read = await noor.get<AttemptReply>(`/api/attempts/${id}`)
    expect(read.status).toBe(200)
    expect(saved.body.attempt).toEqual(read.body.attempt)
    expect(saved.body.attempt.id).toBe(id)
  })

  it('answers a copy of a stored attempt with it after its drill was taken from the student, and refuses a new one', async () => {
    const teacher = await makeAccount('teacher')
    const student = await makeAccount('student')
    const cls = (await teacher.client.post<{ id: number, joinCode: string }>('/api/classes', { name: 'Withdrawn drills' })).body
    expect((await student.client.post('/api/classes/join', { code: cls.joinCode })).status).toBe(200)
    const drillId = (await teacher.client.post<{ id: number }>('/api/drills', { hand: 'right', tempoBpm: 80, meter: '4/4', key: 'C major', level: 1, kind: 'scale', tags: [], title: 'A private five-finger drill', notation: 'C4/1 D4/2 E4/3 F4/4 | G4/5' })).body.id
    const setId = (await teacher.client.post<{ id: number }>('/api/drill-sets', { title: 'Private set', items: [{ drillId }] })).body.id
    const dueOn = new Date(Date.now() + 7 * 86_400_000).toISOString().slice(0, 10)
    const assignmentId = (await teacher.client.post<{ id: number }>('/api/assignments', { drillSetId: setId, studentId: student.id, dueOn, timeZone: 'UTC' })).body.id
    const reply = (await student.client.get<DrillReply>(`/api/drills/${drillId}`)).body
    const body = attemptFor(reply, { assignmentId })
    const first = await student.client.post<AttemptReply>('/api/attempts', body)
    expect(first.status).toBe(201)

    expect((await teacher.client.request('DELETE', `/api/assignments/${assignmentId}`)).status).toBe(204)
    // The outbox sends again when an answer was lost: the attempt is stored, so it is answered, not refused.
    const again = await student.client.post<AttemptReply>('/api/attempts', body)
    expect(again.status).toBe(200)
    expect(again.body.attempt).toEqual({ ...first.body.attempt, assignmentId: null })
    const fresh = await student.client.post('/api/attempts', { ...body, id: randomUUID(), assignmentId: null })
    expect(fresh.status).toBe(404)
    expect(fresh.body.message).toMatch(/^drillId:/)
    expect(await testDb()('attempts').where({ student_id: student.id }).count({ n: '*' })).toEqual([{ n: 1 }])
  })
})

describe('GET /api/attempts', () => {
  it('lets the teacher list a student\'s attempts on a drill, and the student only their own', async () => {
    const teacher = await new Client().signIn('teacher@evenhand.test')
    const noorId = Number((await testDb()('users').where({ email: 'student@evenhand.test' }).first('id')).id)
    const mine = await noor.get<{ attempts: { studentId: number }[] }>(`/api/attempts?drill=${drill.drill.id}`)
    expect(mine.status).toBe(200)
    expect(mine.body.attempts.length).toBeGreaterThan(0)
    expect(mine.body.attempts.every(a => a.studentId === noorId)).toBe(true)
    const theirs = await teacher.get<{ attempts: { studentId: number }[] }>(`/api/attempts?drill=${drill.drill.id}&student=${noorId}`)
    expect(theirs.body.attempts.length).toBe(mine.body.attempts.length)
    expect((await noor.get(`/api/attempts?student=${noorId + 1}`)).status).toBe(403)
  })
})
