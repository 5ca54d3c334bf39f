import { randomUUID } from 'node:crypto'
import { parseMidi } from 'midi-file'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { Client, closeTestDb, testDb } from '../support/server'
import { storedResult } from '../support/attempts'

afterAll(closeTestDb)

interface Drill {
  id: number
  title: string
  hand: string
  tempoBpm: number
  meter: string
  key: string | null
  level: number | null
  kind: string
  tags: string[]
  version: number
  archived: boolean
  ownerId: number
  isPublic: boolean
  updatedAt: string
  notes: { pitch: string, beat: number, length: number, finger?: number | null, hand?: string }[]
}
interface Created { id: number, drill: Drill }
interface List { drills: Drill[], shared: Drill[] }
interface ErrorBody { message: string, data?: { issues: { path: string, line?: number, column?: number }[] } }

async function newTeacher(): Promise<Client> {
  const c = new Client()
  const res = await c.post('/api/auth/register', { name: 'Test Teacher', email: `t-${randomUUID()}@example.org`, password: 'a long test password' })
  expect(res.status).toBe(201)
  return c
}

/** JSON columns come back as text or parsed, depending on the driver's settings. */
const json = (value: unknown): unknown => (typeof value === 'string' ? JSON.parse(value) : value)

const SCALE = { title: 'D major, right hand', hand: 'right', tempoBpm: 88, meter: '4/4', key: 'D major', level: 2, kind: 'scale', tags: ['Warm-up', 'sharps'], notation: 'D4/1:1/2 E4/2 F#4/3 G4/1 | A4/2 B4/3 C#5/4 D5/5' }

describe('POST /api/drills', () => {
  let teacher: Client
  beforeAll(async () => {
    teacher = await newTeacher()
  })

  it('creates a drill from notation and answers 201 with its id', async () => {
    const res = await teacher.post<Created>('/api/drills', SCALE)
    expect(res.status).toBe(201)
    expect(res.body.id).toBe(res.body.drill.id)
    // The notation's rule: a length after ':' carries on, so eight quavers of half a beat each.
    expect(res.body.drill.notes.map(n => [n.pitch, n.beat, n.length, n.finger])).toEqual([
      ['D4', 0, 0.5, 1], ['E4', 0.5, 0.5, 2], ['F#4', 1, 0.5, 3], ['G4', 1.5, 0.5, 1],
      ['A4', 2, 0.5, 2], ['B4', 2.5, 0.5, 3], ['C#5', 3, 0.5, 4], ['D5', 3.5, 0.5, 5],
    ])
    expect(res.body.drill).toMatchObject({ level: 2, kind: 'scale', key: 'D major', tags: ['warm-up', 'sharps'], version: 1, archived: false, isPublic: false })
    const version = await testDb()('drill_versions').where({ drill_id: res.body.id, version: 1 }).first()
    expect(json(version.notes)).toHaveLength(8)
  })

  it('creates a drill from a list of notes', async () => {
    const notes = [{ pitch: 'C3', beat: 0, length: 1, finger: 5 }, { pitch: 'G3', beat: 1, length: 1, finger: 1 }]
    const res = await teacher.post<Created>('/api/drills', { title: 'Two notes', hand: 'left', tempoBpm: 60, notes })
    expect(res.status).toBe(201)
    expect(res.body.drill.notes).toEqual(notes)
    expect(res.body.drill.meter).toBe('4/4')
  })

  it('points at the line and column of a notation error, and stores nothing', async () => {
    const before = (await testDb()('drills').count('* as n'))[0]!.n
    const res = await teacher.post<ErrorBody>('/api/drills', { ...SCALE, notation: 'C4/1 D4/2\nE4/3 H4/4' })
    expect(res.status).toBe(400)
    expect(res.body.message).toMatch(/^notation: Line 2, column 6/)
    expect(res.body.data?.issues[0]).toMatchObject({ path: 'notation', line: 2, column: 6 })
    expect((await testDb()('drills').count('* as n'))[0]!.n).toBe(before)
  })

  it.each([
    ['no title', { ...SCALE, title: '' }, /^title:/],
    ['a tempo past 320', { ...SCALE, tempoBpm: 400 }, /^tempoBpm:/],
    ['level 9', { ...SCALE, level: 9 }, /^level:/],
    ['an unknown kind', { ...SCALE, kind: 'etude' }, /^kind:/],
    ['a metre that is not one', { ...SCALE, meter: '4/5' }, /^meter:/],
    ['both notation and notes', { ...SCALE, notes: [{ pitch: 'C4', beat: 0, length: 1 }] }, /^notes:/],
    ['a bar line in the wrong place', { ...SCALE, notation: 'C4 D4 | E4 F4 G4 | A4' }, /^notation: Line 1, column 18: This bar line falls 3 beats/],
  ])('refuses %s with a 400 naming the field', async (_, body, message) => {
    const res = await teacher.post<ErrorBody>('/api/drills', body)
    expect(res.status).toBe(400)
    expect(res.body.message).toMatch(message)
  })

  it('is for teachers only: 401 signed out, 403 for a student', async () => {
    expect((await new Client().post('/api/drills', SCALE)).status).toBe(401)
    const student = await new Client().signIn('theo@evenhand.test')
    expect((await student.post('/api/drills', SCALE)).status).toBe(403)
  })
})

describe('the library of one teacher', () => {
  let teacher: Client
  let other: Client
  let ids: Record<string, number>

  beforeAll(async () => {
    teacher = await newTeacher()
    other = await newTeacher()
    const make = async (body: Record<string, unknown>): Promise<number> => (await teacher.post<Created>('/api/drills', { hand: 'right', tempoBpm: 80, notation: 'C4/1 D4/2 E4/3', ...body })).body.id
    ids = {
      scale: await make({ title: 'Alpha scale', kind: 'scale', level: 1, tags: ['warm-up'] }),
      arpeggio: await make({ title: 'Beta arpeggio', kind: 'arpeggio', level: 3, hand: 'left', notation: 'C3/5 E3/3 G3/1' }),
      passage: await make({ title: 'Gamma passage', kind: 'passage', level: 3, tags: ['exam piece'] }),
    }
  })

  it('lists only the teacher\'s own drills, and the public demo drills apart', async () => {
    const res = await teacher.get<List>('/api/drills')
    expect(res.status).toBe(200)
    expect(res.body.drills.map(d => d.title).sort()).toEqual(['Alpha scale', 'Beta arpeggio', 'Gamma passage'])
    // The demo studio marks three of Wren Halloway's drills public (seeds/demo/studio.ts); her private ones never show.
    const shared = res.body.shared.map(d => d.title)
    expect(shared).toContain('C major scale, right hand')
    expect(shared).not.toContain('B flat major scale, right hand')
    expect(res.body.shared.every(d => d.isPublic)).toBe(true)
  })

  it('keeps the demo teacher\'s drills hers', async () => {
    const demo = await new Client().signIn('teacher@evenhand.test')
    const res = await demo.get<List>('/api/drills')
    expect(res.body.drills.map(d => d.title)).toContain('B flat major scale, right hand')
    expect(res.body.drills.map(d => d.title)).not.toContain('Alpha scale')
  })

  it('searches title and tags, filters by hand, level and kind, and sorts', async () => {
    const titles = async (query: string): Promise<string[]> => (await teacher.get<List>(`/api/drills?${query}`)).body.drills.map(d => d.title)
    expect(await titles('q=GAMMA')).toEqual(['Gamma passage'])
    expect(await titles('q=exam')).toEqual(['Gamma passage'])
    expect(await titles('q=50%25')).toEqual([])
    expect(await titles('hand=left')).toEqual(['Beta arpeggio'])
    expect(await titles('level=3&sort=title')).toEqual(['Beta arpeggio', 'Gamma passage'])
    expect(await titles('kind=scale')).toEqual(['Alpha scale'])
    expect(await titles('sort=title')).toEqual(['Alpha scale', 'Beta arpeggio', 'Gamma passage'])
    // Most recently changed first.
    expect(await titles('sort=updated')).toEqual(['Gamma passage', 'Beta arpeggio', 'Alpha scale'])
    expect((await teacher.get('/api/drills?level=0')).status).toBe(400)
    expect((await teacher.get('/api/drills?sort=colour')).status).toBe(400)
  })

  it('archives and restores, hiding archived drills behind the filter; 409 when already so', async () => {
    const archived = await teacher.post<{ drill: Drill }>(`/api/drills/${ids.passage}/archive`)
    expect(archived.status).toBe(200)
    expect(archived.body.drill.archived).toBe(true)
    expect((await teacher.post(`/api/drills/${ids.passage}/archive`)).status).toBe(409)
    expect((await teacher.get<List>('/api/drills')).body.drills.map(d => d.title)).not.toContain('Gamma passage')
    expect((await teacher.get<List>('/api/drills?archived=true')).body.drills.map(d => d.title)).toEqual(['Gamma passage'])
    expect((await teacher.post(`/api/drills/${ids.passage}/restore`)).status).toBe(200)
    expect((await teacher.post(`/api/drills/${ids.passage}/restore`)).status).toBe(409)
    expect((await teacher.get<List>('/api/drills')).body.drills.map(d => d.title)).toContain('Gamma passage')
  })

  it('duplicates its own drill and copies a shared one into the library', async () => {
    const copy = await teacher.post<Created>(`/api/drills/${ids.scale}/duplicate`)
    expect(copy.status).toBe(201)
    expect(copy.body.drill).toMatchObject({ title: 'Alpha scale (copy)', level: 1, tags: ['warm-up'], version: 1 })
    expect(copy.body.id).not.toBe(ids.scale)
    const shared = (await teacher.get<List>('/api/drills')).body.shared.find(d => d.title === 'C major scale, right hand')!
    const mine = await teacher.post<Created>(`/api/drills/${shared.id}/duplicate`)
    expect(mine.status).toBe(201)
    const original = (await teacher.get<{ drill: Drill }>(`/api/drills/${shared.id}`)).body.drill
    expect(mine.body.drill.notes).toEqual(original.notes)
    expect(mine.body.drill.isPublic).toBe(false)
    const row = await testDb()('drills').where('id', mine.body.id).first()
    expect(Number(row.copied_from_id)).toBe(shared.id)
    // The shared original stays the demo teacher's, unchanged and unchangeable by others.
    expect((await teacher.request('PATCH', `/api/drills/${shared.id}`, { title: 'Mine now' })).status).toBe(403)
    expect((await teacher.post(`/api/drills/${shared.id}/archive`)).status).toBe(403)
  })

  it('never lets another teacher read, change, copy or export a private drill', async () => {
    const id = ids.scale
    expect((await other.get(`/api/drills/${id}`)).status).toBe(404)
    expect((await other.request('PATCH', `/api/drills/${id}`, { title: 'Taken' })).status).toBe(404)
    expect((await other.post(`/api/drills/${id}/archive`)).status).toBe(404)
    expect((await other.post(`/api/drills/${id}/duplicate`)).status).toBe(404)
    expect((await other.get(`/api/drills/${id}/versions`)).status).toBe(404)
    expect((await other.get(`/api/drills/${id}/export.mid`)).status).toBe(404)
    expect((await other.get(`/api/drills/${id}/export.musicxml`)).status).toBe(404)
    expect((await other.get<List>('/api/drills')).body.drills).toEqual([])
    const row = await testDb()('drills').where('id', id).first()
    expect(row.title).toBe('Alpha scale')
  })

  it('answers 404 for a drill that does not exist and 400 for an id that is not one', async () => {
    expect((await teacher.get('/api/drills/999999999')).status).toBe(404)
    expect((await teacher.request('PATCH', '/api/drills/999999999', { title: 'x' })).status).toBe(404)
    expect((await teacher.get('/api/drills/abc/export.mid')).status).toBe(400)
    expect((await teacher.post('/api/drills/-1/duplicate')).status).toBe(400)
  })
})

describe('editing and versions', () => {
  it('corrects an unplayed version in place and makes a new version once students have played it', async () => {
    const teacher = await newTeacher()
    const created = (await teacher.post<Created>('/api/drills', { title: 'Versioned', hand: 'right', tempoBpm: 80, notation: 'C4/1 D4/2 E4/3' })).body
    const id = created.id

    const fixed = await teacher.request<{ drill: Drill }>('PATCH', `/api/drills/${id}`, { notation: 'C4/1 D4/2 E4/3 F4/4', updatedAt: created.drill.updatedAt })
    expect(fixed.status).toBe(200)
    expect(fixed.body.drill.version).toBe(1)
    expect(fixed.body.drill.notes).toHaveLength(4)

    // A student's attempt on version 1, written straight to the table as the attempts route would.
    const student = await testDb()('users').where('email', 'theo@evenhand.test').first()
    await testDb()('attempts').insert({
      id: randomUUID(), student_id: student.id, drill_id: id, drill_version: 1, started_at: new Date(), tempo_bpm: 80,
      input_device: 'screen', events: '[]', score: 0, result: storedResult(), engine_version: 'test',
    })

    const details = await teacher.request<{ drill: Drill }>('PATCH', `/api/drills/${id}`, { title: 'Versioned, renamed', tags: ['renamed'] })
    expect(details.body.drill.version).toBe(1)
    const changed = await teacher.request<{ drill: Drill }>('PATCH', `/api/drills/${id}`, { notes: [{ pitch: 'G4', beat: 0, length: 2, finger: 5 }], tempoBpm: 90 })
    expect(changed.body.drill.version).toBe(2)

    const versions = await teacher.get<{ versions: { version: number, noteCount: number, attempts: number, tempoBpm: number, createdAt: string }[] }>(`/api/drills/${id}/versions`)
    expect(versions.status).toBe(200)
    expect(versions.body.versions.map(v => [v.version, v.noteCount, v.attempts, v.tempoBpm])).toEqual([[2, 1, 0, 90], [1, 4, 1, 80]])
    expect(Number.isNaN(Date.parse(versions.body.versions[0]!.createdAt))).toBe(false)
    const old = await testDb()('drill_versions').where({ drill_id: id, version: 1 }).first()
    expect((json(old.notes) as { pitch: string }[]).map(n => n.pitch)).toEqual(['C4', 'D4', 'E4', 'F4'])
  })

  it('answers 409 to a change made from a stale copy, and keeps the newer one', async () => {
    const teacher = await newTeacher()
    const created = (await teacher.post<Created>('/api/drills', { title: 'Contested', hand: 'right', tempoBpm: 80, notation: 'C4/1' })).body
    const first = await teacher.request('PATCH', `/api/drills/${created.id}`, { title: 'First change', updatedAt: created.drill.updatedAt })
    expect(first.status).toBe(200)
    const second = await teacher.request<ErrorBody>('PATCH', `/api/drills/${created.id}`, { title: 'Second change', updatedAt: created.drill.updatedAt })
    expect(second.status).toBe(409)
    expect((await testDb()('drills').where('id', created.id).first()).title).toBe('First change')
  })

  it('refuses a bad change with a 400 and keeps the drill', async () => {
    const teacher = await newTeacher()
    const created = (await teacher.post<Created>('/api/drills', { title: 'Kept', hand: 'right', tempoBpm: 80, notation: 'C4/1' })).body
    const res = await teacher.request<ErrorBody>('PATCH', `/api/drills/${created.id}`, { notation: 'C4/9' })
    expect(res.status).toBe(400)
    expect(res.body.message).toMatch(/^notation: Line 1, column/)
    expect((await teacher.request('PATCH', `/api/drills/${created.id}`, { tempoBpm: 'fast' })).status).toBe(400)
    expect(json((await testDb()('drills').where('id', created.id).first()).notes)).toEqual([{ pitch: 'C4', beat: 0, length: 1, finger: 1 }])
  })
})

describe('exports', () => {
  it('writes a Standard MIDI File that midi-file reads back with the drill\'s notes and tempo', async () => {
    const teacher = await newTeacher()
    const { id } = (await teacher.post<Created>('/api/drills', { title: 'Export me', hand: 'both', tempoBpm: 75, notation: 'RH E4/3:2 G4/5\nLH C3/5:4' })).body
    const res = await teacher.get<Uint8Array>(`/api/drills/${id}/export.mid`)
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toBe('audio/midi')
    expect(res.headers.get('content-disposition')).toBe('attachment; filename="export-me.mid"')
    const midi = parseMidi(res.body)
    const perTick = 60_000_000 / 75
    expect(midi.tracks.flat().find(e => e.type === 'setTempo')).toMatchObject({ microsecondsPerBeat: Math.round(perTick) })
    const ticksPerBeat = midi.header.ticksPerBeat!
    const ons = midi.tracks.map((track) => {
      let tick = 0
      return track.flatMap((e) => {
        tick += e.deltaTime
        return e.type === 'noteOn' && e.velocity > 0 ? [[e.noteNumber, tick / ticksPerBeat]] : []
      })
    }).filter(t => t.length)
    // E4 = 64 and G4 = 67 at beats 0 and 2 (right hand), C3 = 48 at beat 0 (left hand): MIDI 1.0 note numbers.
    expect(ons).toEqual([[[64, 0], [67, 2]], [[48, 0]]])
  })

  it('lets a student export a drill assigned to them but not one of another class', async () => {
    const teacher = await new Client().signIn('teacher@evenhand.test')
    const all = (await teacher.get<List>('/api/drills')).body.drills
    const theo = await new Client().signIn('theo@evenhand.test')
    const five = all.find(d => d.title === 'Five-finger pattern in C, right hand')!
    const bflat = all.find(d => d.title === 'B flat major scale, right hand')!
    expect((await theo.get(`/api/drills/${five.id}/export.musicxml`)).status).toBe(200)
    expect((await theo.get(`/api/drills/${bflat.id}/export.musicxml`)).status).toBe(404)
    expect((await new Client().get(`/api/drills/${five.id}/export.mid`)).status).toBe(401)
    expect((await theo.get(`/api/drills/${five.id}/versions`)).status).toBe(403)
  })
})
