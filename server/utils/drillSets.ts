// Drill sets belong to the teacher who made them; every function here takes that teacher's id.
import type { Knex } from 'knex'
import type { DrillSetItemInput } from '#shared/types/drillSet'

export interface DrillSetItemView {
  drillId: number
  title: string
  kind: string
  hand: string
  tempoBpm: number
  isPublic: boolean
  targetBpm: number | null
  targetScore: number | null
}

export interface DrillSetView {
  id: number
  title: string
  archived: boolean
  createdAt: string
  /** How many assignments use the set, so the teacher knows an edit reaches students. */
  assignmentCount: number
  items: DrillSetItemView[]
}

type Db = Knex | Knex.Transaction

function notFound(): Error {
  return createError({ statusCode: 404, statusMessage: 'Not found', message: 'Drill set not found' })
}

/** The set's row when `teacherId` owns it; a 404 otherwise, so another teacher's sets look like none at all. */
export async function ownDrillSet(db: Db, teacherId: number, id: number, lock = false): Promise<{ id: number, title: string }> {
  const row = await db('drill_sets').where({ id, owner_id: teacherId }).modify(q => lock && q.forUpdate()).first('id', 'title')
  if (!row) throw notFound()
  return { id: Number(row.id), title: row.title }
}

/** A 400 naming the item whose drill the teacher may not use (neither theirs nor public). */
async function checkDrills(db: Db, teacherId: number, items: DrillSetItemInput[]): Promise<void> {
  if (!items.length) return
  const usable = new Set((await db('drills').whereIn('id', items.map(i => i.drillId))
    .where(q => q.where('owner_id', teacherId).orWhere('is_public', true)).select('id')).map(r => Number(r.id)))
  const bad = items.findIndex(i => !usable.has(i.drillId))
  if (bad >= 0) {
    throw createError({ statusCode: 400, statusMessage: 'Invalid input', message: `items.${bad}.drillId: No such drill`, data: { issues: [{ path: `items.${bad}.drillId`, message: 'No such drill' }] } })
  }
}

export async function writeItems(db: Db, teacherId: number, setId: number, items: DrillSetItemInput[]): Promise<void> {
  await checkDrills(db, teacherId, items)
  await db('drill_set_items').where({ drill_set_id: setId }).delete()
  if (items.length) {
    await db('drill_set_items').insert(items.map((item, position) => ({
      drill_set_id: setId, drill_id: item.drillId, position, target_tempo_bpm: item.targetBpm ?? null, target_score: item.targetScore ?? null,
    })))
  }
}

export async function createDrillSet(db: Knex, teacherId: number, title: string, items: DrillSetItemInput[]): Promise<number> {
  return db.transaction(async (trx) => {
    const [id] = await trx('drill_sets').insert({ owner_id: teacherId, title })
    await writeItems(trx, teacherId, Number(id), items)
    return Number(id)
  })
}

/** The teacher's sets with their drills in order; `ids` narrows to some of them. */
export async function describeDrillSets(db: Knex, teacherId: number, options: { ids?: number[], archived?: boolean } = {}): Promise<DrillSetView[]> {
  const sets: { id: number, title: string, archived_at: Date | null, created_at: Date, n: number }[] = await db('drill_sets as s')
    .where('s.owner_id', teacherId)
    .modify((q) => {
      if (options.ids) q.whereIn('s.id', options.ids)
      if (options.archived !== undefined) q.where(w => options.archived ? w.whereNotNull('s.archived_at') : w.whereNull('s.archived_at'))
    })
    .orderBy([{ column: 's.title' }, { column: 's.id' }])
    .select('s.id', 's.title', 's.archived_at', 's.created_at', db('assignments as a').whereRaw('a.drill_set_id = s.id').count('*').as('n'))
  if (!sets.length) return []
  const items: { drill_set_id: number, drill_id: number, title: string, kind: string, hand: string, tempo_bpm: number, is_public: number, target_tempo_bpm: number | null, target_score: number | null }[]
    = await db('drill_set_items as i').join('drills as d', 'd.id', 'i.drill_id')
      .whereIn('i.drill_set_id', sets.map(s => s.id)).orderBy(['i.drill_set_id', 'i.position'])
      .select('i.drill_set_id', 'i.drill_id', 'd.title', 'd.kind', 'd.hand', 'd.tempo_bpm', 'd.is_public', 'i.target_tempo_bpm', 'i.target_score')
  return sets.map(s => ({
    id: Number(s.id),
    title: s.title,
    archived: s.archived_at !== null,
    createdAt: new Date(s.created_at).toISOString(),
    assignmentCount: Number(s.n),
    items: items.filter(i => Number(i.drill_set_id) === Number(s.id)).map(i => ({
      drillId: Number(i.drill_id),
      title: i.title,
      kind: i.kind,
      hand: i.hand,
      tempoBpm: i.tempo_bpm,
      isPublic: Boolean(i.is_public),
      targetBpm: i.target_tempo_bpm,
      targetScore: i.target_score,
    })),
  }))
}

export async function describeDrillSet(db: Knex, teacherId: number, id: number): Promise<DrillSetView> {
  const [set] = await describeDrillSets(db, teacherId, { ids: [id] })
  if (!set) throw notFound()
  return set
}

/** A copy with the same drills and targets, titled "… (copy)", never archived. */
export async function duplicateDrillSet(db: Knex, teacherId: number, id: number): Promise<number> {
  const set = await describeDrillSet(db, teacherId, id)
  const title = `${set.title.slice(0, 153)} (copy)`
  return createDrillSet(db, teacherId, title, set.items.map(i => ({ drillId: i.drillId, targetBpm: i.targetBpm, targetScore: i.targetScore })))
}
