import type { Knex } from 'knex'
import type { H3Event } from 'h3'
import { z } from 'zod'
import { stringify } from 'csv-stringify/sync'

export interface ProgressCell {
  attempts: number
  best: number | null
  latest: number | null
  /** Latest score minus the mean of the up to four attempts before it; null with fewer than two attempts. */
  trend: number | null
  /** Past the due date of an assignment holding this drill without reaching its target score. */
  overdue: boolean
}

export interface ClassProgress {
  classId: number
  className: string
  students: { id: number, name: string }[]
  drills: { id: number, title: string, kind: string, targetScore: number | null, dueAt: string | null }[]
  /** cells[studentId][drillId] */
  cells: Record<number, Record<number, ProgressCell>>
}

/** Students × drills of one class: what a teacher reads at a glance before a lesson. */
export async function classProgress(db: Knex, classId: number, className: string, now = Date.now()): Promise<ClassProgress> {
  const students: { id: number, name: string }[] = await db('class_members as m').join('users as u', 'u.id', 'm.student_id')
    .where('m.class_id', classId).orderBy('u.name').select('u.id', 'u.name')
  const items: { id: number, title: string, kind: string, target_score: number | null, due_at: Date | null }[] = await db('assignments as a')
    .join('drill_set_items as i', 'i.drill_set_id', 'a.drill_set_id').join('drills as d', 'd.id', 'i.drill_id')
    .where('a.class_id', classId).orderBy([{ column: 'a.due_at' }, { column: 'i.position' }])
    .select('d.id', 'd.title', 'd.kind', 'i.target_score', 'a.due_at')
  const drills = new Map<number, ClassProgress['drills'][number]>()
  for (const it of items) {
    if (!drills.has(Number(it.id))) {
      drills.set(Number(it.id), { id: Number(it.id), title: it.title, kind: it.kind, targetScore: it.target_score, dueAt: it.due_at ? new Date(it.due_at).toISOString() : null })
    }
  }
  const attempts: { student_id: number, drill_id: number, score: number }[] = students.length && drills.size
    ? await db('attempts').whereIn('student_id', students.map(s => s.id)).whereIn('drill_id', [...drills.keys()])
        .orderBy('started_at').select('student_id', 'drill_id', 'score')
    : []
  const scores = new Map<string, number[]>()
  for (const a of attempts) {
    const key = `${a.student_id}:${a.drill_id}`
    scores.set(key, [...(scores.get(key) ?? []), Number(a.score)])
  }
  const cells: ClassProgress['cells'] = {}
  for (const s of students) {
    cells[s.id] = {}
    for (const d of drills.values()) {
      const list = scores.get(`${s.id}:${d.id}`) ?? []
      const best = list.length ? Math.max(...list) : null
      const before = list.slice(-5, -1)
      cells[s.id]![d.id] = {
        attempts: list.length,
        best,
        latest: list.at(-1) ?? null,
        trend: before.length ? list.at(-1)! - before.reduce((x, y) => x + y, 0) / before.length : null,
        overdue: d.dueAt !== null && Date.parse(d.dueAt) < now && (best === null || best < (d.targetScore ?? 0)),
      }
    }
  }
  return { classId, className, students, drills: [...drills.values()], cells }
}

/** One row per student and drill, for a spreadsheet: RFC 4180 quoting, and text cells that a spreadsheet would read as a formula prefixed with '. */
export function progressCsv(p: ClassProgress): string {
  const rows: (string | number | null)[][] = [['class', 'student', 'drill', 'attempts', 'best', 'latest', 'trend', 'overdue']]
  for (const s of p.students) {
    for (const d of p.drills) {
      const c = p.cells[s.id]![d.id]!
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
  return classProgress(db, id, row.name)
}
