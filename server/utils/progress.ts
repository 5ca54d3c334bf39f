import type { Knex } from 'knex'
import type { H3Event } from 'h3'
import { z } from 'zod'
import { stringify } from 'csv-stringify/sync'

export interface ProgressCell {
  /** Whether a set holding this drill reaches the student (through the class or on their own). */
  assigned: boolean
  attempts: number
  best: number | null
  latest: number | null
  /** Latest score minus the mean of the up to four attempts before it; null with fewer than two attempts. */
  trend: number | null
  /** Past the due date of an assignment reaching this student with this drill, without reaching its target score. */
  overdue: boolean
}

export interface ClassProgress {
  classId: number
  className: string
  students: { id: number, name: string }[]
  /** Drills of the class's assignments and of assignments made to one of its students; `dueAt` is the class-wide one. */
  drills: { id: number, title: string, kind: string, targetScore: number | null, dueAt: string | null, forSomeOnly: boolean }[]
  /** cells[studentId][drillId] */
  cells: Record<number, Record<number, ProgressCell>>
}

interface ItemRow { id: number, title: string, kind: string, target_score: number | null, due_at: Date | null, student_id: number | null }

interface CellFigures { attempts: number, best: number, latest: number, beforeSum: number, beforeCount: number }

/**
 * Count, best and latest score of each student × drill, and the sum and count of the up to four scores
 * before the latest (for the trend), aggregated in MariaDB over the covering index
 * (student_id, drill_id, started_at, score): no attempt row leaves the database, however many were played.
 * Attempts started in the same millisecond are ordered by id, so "latest" is one attempt.
 */
async function cellFigures(db: Knex, studentIds: number[], drillIds: number[]): Promise<Map<string, CellFigures>> {
  const ranked = db('attempts').whereIn('student_id', studentIds).whereIn('drill_id', drillIds)
    .select('student_id', 'drill_id', 'score',
      db.raw('ROW_NUMBER() OVER (PARTITION BY student_id, drill_id ORDER BY started_at DESC, id DESC) AS rn'))
  const rows: Record<string, unknown>[] = await db.from(ranked.as('r')).groupBy('student_id', 'drill_id').select(
    'student_id', 'drill_id',
    db.raw('COUNT(*) AS n'),
    db.raw('MAX(score) AS best'),
    db.raw('MAX(CASE WHEN rn = 1 THEN score END) AS latest'),
    db.raw('SUM(CASE WHEN rn BETWEEN 2 AND 5 THEN score END) AS before_sum'),
    db.raw('COUNT(CASE WHEN rn BETWEEN 2 AND 5 THEN 1 END) AS before_n'),
  )
  return new Map(rows.map(r => [`${r.student_id}:${r.drill_id}`, {
    attempts: Number(r.n),
    best: Number(r.best),
    latest: Number(r.latest),
    beforeSum: Number(r.before_sum ?? 0),
    beforeCount: Number(r.before_n),
  }]))
}

/** Students × drills of one class: what a teacher reads at a glance before a lesson. */
export async function classProgress(db: Knex, teacherId: number, classId: number, className: string, now = Date.now()): Promise<ClassProgress> {
  const students: { id: number, name: string }[] = await db('class_members as m').join('users as u', 'u.id', 'm.student_id')
    .where('m.class_id', classId).orderBy('u.name').select('u.id', 'u.name')
  const studentIds = students.map(s => Number(s.id))
  // The class's own assignments, and this teacher's assignments to one of its students.
  const items: ItemRow[] = await db('assignments as a')
    .join('drill_set_items as i', 'i.drill_set_id', 'a.drill_set_id').join('drills as d', 'd.id', 'i.drill_id')
    .where(q => q.where('a.class_id', classId).orWhere(w => w.whereIn('a.student_id', studentIds).where('a.assigned_by', teacherId)))
    .orderBy([{ column: 'a.student_id' }, { column: 'a.due_at' }, { column: 'i.position' }])
    .select('d.id', 'd.title', 'd.kind', 'i.target_score', 'a.due_at', 'a.student_id')
  const drills = new Map<number, ClassProgress['drills'][number]>()
  for (const it of items) {
    const id = Number(it.id)
    const classWide = it.student_id === null
    const known = drills.get(id)
    if (!known) {
      drills.set(id, { id, title: it.title, kind: it.kind, targetScore: it.target_score, dueAt: classWide && it.due_at ? new Date(it.due_at).toISOString() : null, forSomeOnly: !classWide })
    }
    else if (classWide && known.forSomeOnly) {
      Object.assign(known, { forSomeOnly: false, targetScore: it.target_score, dueAt: it.due_at ? new Date(it.due_at).toISOString() : null })
    }
  }
  const figures = students.length && drills.size ? await cellFigures(db, studentIds, [...drills.keys()]) : new Map<string, CellFigures>()
  const cells: ClassProgress['cells'] = {}
  for (const s of students) {
    cells[s.id] = {}
    // The assignments that reach this student: the class's, and the ones made to them alone.
    const reaching = items.filter(it => it.student_id === null || Number(it.student_id) === Number(s.id))
    for (const d of drills.values()) {
      const f = figures.get(`${s.id}:${d.id}`)
      const best = f?.best ?? null
      const dues = reaching.filter(it => Number(it.id) === d.id)
      cells[s.id]![d.id] = {
        assigned: dues.length > 0,
        attempts: f?.attempts ?? 0,
        best,
        latest: f?.latest ?? null,
        trend: f && f.beforeCount > 0 ? f.latest - f.beforeSum / f.beforeCount : null,
        overdue: dues.some(it => it.due_at !== null && new Date(it.due_at).getTime() < now && (best === null || best < (it.target_score ?? 0))),
      }
    }
  }
  return { classId, className, students, drills: [...drills.values()], cells }
}

/** One row per student and drill assigned to them, for a spreadsheet: RFC 4180 quoting, and text cells that a spreadsheet would read as a formula prefixed with '. */
export function progressCsv(p: ClassProgress): string {
  const rows: (string | number | null)[][] = [['class', 'student', 'drill', 'attempts', 'best', 'latest', 'trend', 'overdue']]
  for (const s of p.students) {
    for (const d of p.drills) {
      const c = p.cells[s.id]![d.id]!
      // A drill given to another student alone is no row of this one's.
      if (!c.assigned) continue
      rows.push([p.className, s.name, d.title, c.attempts, c.best, c.latest, c.trend === null ? null : Math.round(c.trend), c.overdue ? 'yes' : 'no'])
    }
  }
  return stringify(rows, { escape_formulas: true, record_delimiter: 'windows' })
}

const ClassParams = z.object({ id: z.coerce.number().int().positive() })

/** The progress of a class of the signed-in teacher's own, for the JSON and CSV routes alike. */
export async function ownClassProgress(event: H3Event): Promise<ClassProgress> {
  const teacher = await requireRole(event, 'teacher')
  const { id } = validParams(event, ClassParams)
  const db = useDb()
  const row = await db('classes').where({ id, teacher_id: teacher.id }).first('name')
  if (!row) throw createError({ statusCode: 404, statusMessage: 'Not found', message: 'Class not found' })
  return classProgress(db, teacher.id, id, row.name)
}
