import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { Client, closeTestDb, testDb } from '../support/server'
import { newTeacher, publicDrillIds } from '../support/studio'
import { TEMPO_LIMITS } from '../../shared/utils/tempo'

afterAll(closeTestDb)

interface SetView { id: number, title: string, archived: boolean, items: { drillId: number, targetBpm: number | null, targetScore: number | null }[] }

let teacher: Client
let drills: number[]

beforeAll(async () => {
  teacher = await newTeacher()
  drills = await publicDrillIds()
  expect(drills.length).toBeGreaterThanOrEqual(3)
})

describe('drill sets', () => {
  it('creates a set from public drills with targets and reads it back in order', async () => {
    const res = await teacher.post('/api/drill-sets', { title: '  Week one ', items: [
      { drillId: drills[2], targetBpm: 90, targetScore: 80 },
      { drillId: drills[0] },
    ] })
    expect(res.status).toBe(201)
    const id = Number(res.body.id)
    const rows = await testDb()('drill_set_items').where({ drill_set_id: id }).orderBy('position')
    expect(rows.map(r => [Number(r.drill_id), r.target_tempo_bpm, r.target_score])).toEqual([[drills[2], 90, 80], [drills[0], null, null]])
    const read = await teacher.get<{ drillSet: SetView }>(`/api/drill-sets/${id}`)
    expect(read.body.drillSet.title).toBe('Week one')
    expect(read.body.drillSet.items.map(i => i.drillId)).toEqual([drills[2], drills[0]])
  })

  it('renames, reorders, adds and removes drills and archives in one patch each', async () => {
    const { body } = await teacher.post('/api/drill-sets', { title: 'To edit', items: [{ drillId: drills[0] }, { drillId: drills[1] }] })
    const id = Number(body.id)
    const renamed = await teacher.request<{ drillSet: SetView }>('PATCH', `/api/drill-sets/${id}`, { title: 'Edited' })
    expect(renamed.body.drillSet.title).toBe('Edited')
    const reordered = await teacher.request<{ drillSet: SetView }>('PATCH', `/api/drill-sets/${id}`, {
      items: [{ drillId: drills[2], targetBpm: TEMPO_LIMITS.max }, { drillId: drills[1], targetScore: 70 }],
    })
    expect(reordered.status).toBe(200)
    expect(reordered.body.drillSet.items).toMatchObject([{ drillId: drills[2], targetBpm: TEMPO_LIMITS.max }, { drillId: drills[1], targetScore: 70 }])
    const archived = await teacher.request<{ drillSet: SetView }>('PATCH', `/api/drill-sets/${id}`, { archived: true })
    expect(archived.body.drillSet.archived).toBe(true)
    const open = await teacher.get<{ drillSets: SetView[] }>('/api/drill-sets?archived=false')
    expect(open.body.drillSets.map(s => s.id)).not.toContain(id)
    const old = await teacher.get<{ drillSets: SetView[] }>('/api/drill-sets?archived=true')
    expect(old.body.drillSets.map(s => s.id)).toEqual([id])
  })

  it('duplicates a set with its drills and targets under a new id', async () => {
    const { body } = await teacher.post('/api/drill-sets', { title: 'Original', items: [{ drillId: drills[1], targetBpm: 66, targetScore: 75 }] })
    const copy = await teacher.post('/api/drill-sets/' + body.id + '/duplicate')
    expect(copy.status).toBe(201)
    expect(copy.body.id).not.toBe(body.id)
    const read = await teacher.get<{ drillSet: SetView }>(`/api/drill-sets/${copy.body.id}`)
    expect(read.body.drillSet).toMatchObject({ title: 'Original (copy)', archived: false, items: [{ drillId: drills[1], targetBpm: 66, targetScore: 75 }] })
  })

  it.each([
    ['no title', { items: [] }, 'title'],
    ['a title longer than the column', { title: 'x'.repeat(161), items: [] }, 'title'],
    ['a tempo above the project\'s limit', { title: 'T', items: [{ drillId: 1, targetBpm: TEMPO_LIMITS.max + 1 }] }, 'items.0.targetBpm'],
    ['a tempo below it', { title: 'T', items: [{ drillId: 1, targetBpm: TEMPO_LIMITS.min - 1 }] }, 'items.0.targetBpm'],
    ['a score above 100', { title: 'T', items: [{ drillId: 1, targetScore: 101 }] }, 'items.0.targetScore'],
    ['a drill twice', { title: 'T', items: [{ drillId: 1 }, { drillId: 1 }] }, 'items'],
    ['a drill id that is not a number', { title: 'T', items: [{ drillId: 'one' }] }, 'items.0.drillId'],
  ])('answers 400 naming the field for %s', async (_, body, field) => {
    const res = await teacher.post('/api/drill-sets', body)
    expect(res.status).toBe(400)
    expect(String(res.body.message)).toMatch(new RegExp(`^${field.replace(/\./g, '\\.')}:`))
  })

  it('refuses another teacher\'s private drill as an item with a 400 naming it', async () => {
    const privateDrill = await testDb()('drills').where({ is_public: false }).first('id')
    const res = await teacher.post('/api/drill-sets', { title: 'T', items: [{ drillId: drills[0] }, { drillId: Number(privateDrill.id) }] })
    expect(res.status).toBe(400)
    expect(res.body.message).toBe('items.1.drillId: No such drill')
  })

  it('keeps each teacher\'s sets to themselves and refuses students and strangers', async () => {
    const { body } = await teacher.post('/api/drill-sets', { title: 'Mine', items: [{ drillId: drills[0] }] })
    const other = await newTeacher('Other')
    expect((await other.get(`/api/drill-sets/${body.id}`)).status).toBe(404)
    expect((await other.request('PATCH', `/api/drill-sets/${body.id}`, { title: 'Taken' })).status).toBe(404)
    expect((await other.post(`/api/drill-sets/${body.id}/duplicate`)).status).toBe(404)
    const list = await other.get<{ drillSets: SetView[] }>('/api/drill-sets')
    expect(list.body.drillSets).toEqual([])
    expect((await testDb()('drill_sets').where({ id: body.id }).first('title')).title).toBe('Mine')
    const student = await new Client().signIn('student@evenhand.test')
    expect((await student.get('/api/drill-sets')).status).toBe(403)
    expect((await student.post('/api/drill-sets', { title: 'S', items: [] })).status).toBe(403)
    expect((await new Client().get('/api/drill-sets')).status).toBe(401)
    expect((await teacher.get('/api/drill-sets/0')).status).toBe(400)
    expect((await teacher.get('/api/drill-sets/99999999')).status).toBe(404)
  })
})
