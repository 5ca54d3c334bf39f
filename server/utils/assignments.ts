import type { Knex } from 'knex'

export interface AssignmentItem {
  drillId: number
  title: string
  kind: string
  hand: string
  targetTempoBpm: number | null
  targetScore: number | null
  /** The student's own record on this drill within this assignment (students only). */
  attempts?: number
  bestScore?: number | null
  latestScore?: number | null
}

export interface AssignmentView {
  id: number
  drillSetId: number
  drillSetTitle: string
  target: { kind: 'class' | 'student', id: number, name: string }
  dueAt: string | null
  overdue: boolean
  note: string | null
  createdAt: string
  items: AssignmentItem[]
}

interface AssignmentDbRow {
  id: number
  drill_set_id: number
  title: string
  class_id: number | null
  class_name: string | null
  student_id: number | null
  student_name: string | null
  due_at: Date | null
  note: string | null
  created_at: Date
}

interface ItemDbRow {
  drill_set_id: number
  id: number
  title: string
  kind: string
  hand: string
  target_tempo_bpm: number | null
  target_score: number | null
}

interface RecordDbRow { assignment_id: number, drill_id: number, n: number, best: number, latest: string }

/** Assignments as the home pages show them, with their drills in order; `studentId` adds that student's record. */
export async function describeAssignments(db: Knex, assignmentQuery: Knex.QueryBuilder, studentId?: number): Promise<AssignmentView[]> {
  const rows: AssignmentDbRow[] = await assignmentQuery.clone()
    .join('drill_sets as ds', 'ds.id', 'a.drill_set_id')
    .leftJoin('classes as c', 'c.id', 'a.class_id')
    .leftJoin('users as s', 's.id', 'a.student_id')
    .orderBy([{ column: 'a.due_at', order: 'asc' }, { column: 'a.id' }])
    .select('a.id', 'a.drill_set_id', 'ds.title', 'a.class_id', 'c.name as class_name', 'a.student_id', 's.name as student_name', 'a.due_at', 'a.note', 'a.created_at')
  if (!rows.length) return []
  const items: ItemDbRow[] = await db('drill_set_items as dsi').join('drills as d', 'd.id', 'dsi.drill_id')
    .whereIn('dsi.drill_set_id', rows.map(r => r.drill_set_id))
    .orderBy(['dsi.drill_set_id', 'dsi.position'])
    .select('dsi.drill_set_id', 'd.id', 'd.title', 'd.kind', 'd.hand', 'dsi.target_tempo_bpm', 'dsi.target_score')
  const records: RecordDbRow[] = studentId
    ? await db('attempts').where('student_id', studentId).whereIn('assignment_id', rows.map(r => r.id))
        .groupBy('assignment_id', 'drill_id')
        .select('assignment_id', 'drill_id', db.raw('COUNT(*) AS n'), db.raw('MAX(score) AS best'),
          db.raw('SUBSTRING_INDEX(GROUP_CONCAT(score ORDER BY started_at DESC), \',\', 1) AS latest'))
    : []
  const now = Date.now()
  return rows.map((r) => {
    const dueAt = r.due_at ? new Date(r.due_at).toISOString() : null
    return {
      id: Number(r.id),
      drillSetId: Number(r.drill_set_id),
      drillSetTitle: r.title,
      target: r.class_id
        ? { kind: 'class' as const, id: Number(r.class_id), name: r.class_name ?? '' }
        : { kind: 'student' as const, id: Number(r.student_id), name: r.student_name ?? '' },
      dueAt,
      overdue: dueAt !== null && Date.parse(dueAt) < now,
      note: r.note,
      createdAt: new Date(r.created_at).toISOString(),
      items: items.filter(i => i.drill_set_id === r.drill_set_id).map((i) => {
        const item: AssignmentItem = {
          drillId: Number(i.id),
          title: i.title,
          kind: i.kind,
          hand: i.hand,
          targetTempoBpm: i.target_tempo_bpm,
          targetScore: i.target_score,
        }
        if (studentId) {
          const rec = records.find(x => Number(x.assignment_id) === Number(r.id) && Number(x.drill_id) === item.drillId)
          item.attempts = rec ? Number(rec.n) : 0
          item.bestScore = rec ? Number(rec.best) : null
          item.latestScore = rec ? Number(rec.latest) : null
        }
        return item
      }),
    }
  })
}
