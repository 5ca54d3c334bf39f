import type { Knex } from 'knex'
import type { AssignmentInput } from '#shared/types/assignment'

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
  /** The fastest tempo of those attempts (students only). */
  bestTempoBpm?: number | null
  /** Whether the best score reached the target score (students only; false with no target). */
  reachedTarget?: boolean
}

export interface AssignmentView {
  id: number
  drillSetId: number
  drillSetTitle: string
  target: { kind: 'class' | 'student', id: number, name: string }
  dueAt: string | null
  /** The calendar day the teacher chose, read in `timeZone`. */
  dueOn: string | null
  timeZone: string | null
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
  due_on: string | null
  time_zone: string | null
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

interface RecordDbRow { assignment_id: number, drill_id: number, n: number, best: number, latest: string, tempo: string }

/** Assignments as the home pages show them, with their drills in order; `studentId` adds that student's record. */
export async function describeAssignments(db: Knex, assignmentQuery: Knex.QueryBuilder, studentId?: number): Promise<AssignmentView[]> {
  const rows: AssignmentDbRow[] = await assignmentQuery.clone()
    .join('drill_sets as ds', 'ds.id', 'a.drill_set_id')
    .leftJoin('classes as c', 'c.id', 'a.class_id')
    .leftJoin('users as s', 's.id', 'a.student_id')
    .orderBy([{ column: 'a.due_at', order: 'asc' }, { column: 'a.id' }])
    .select('a.id', 'a.drill_set_id', 'ds.title', 'a.class_id', 'c.name as class_name', 'a.student_id', 's.name as student_name', 'a.due_at', db.raw('DATE_FORMAT(a.due_on, \'%Y-%m-%d\') AS due_on'), 'a.time_zone', 'a.note', 'a.created_at')
  if (!rows.length) return []
  const items: ItemDbRow[] = await db('drill_set_items as dsi').join('drills as d', 'd.id', 'dsi.drill_id')
    .whereIn('dsi.drill_set_id', rows.map(r => r.drill_set_id))
    .orderBy(['dsi.drill_set_id', 'dsi.position'])
    .select('dsi.drill_set_id', 'd.id', 'd.title', 'd.kind', 'd.hand', 'dsi.target_tempo_bpm', 'dsi.target_score')
  const records: RecordDbRow[] = studentId
    ? await db('attempts').where('student_id', studentId).whereIn('assignment_id', rows.map(r => r.id))
        .groupBy('assignment_id', 'drill_id')
        .select('assignment_id', 'drill_id', db.raw('COUNT(*) AS n'), db.raw('MAX(score) AS best'), db.raw('MAX(tempo_bpm) AS tempo'),
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
      dueOn: r.due_on,
      timeZone: r.time_zone,
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
          item.bestTempoBpm = rec ? Number(rec.tempo) : null
          item.reachedTarget = item.bestScore != null && item.targetScore !== null && item.bestScore >= item.targetScore
        }
        return item
      }),
    }
  })
}

type Db = Knex | Knex.Transaction

function notFound(what: string): Error {
  return createError({ statusCode: 404, statusMessage: 'Not found', message: `${what} not found` })
}

/** The assignment when `teacherId` made it; a 404 otherwise. */
export async function ownAssignment(db: Db, teacherId: number, id: number): Promise<{ id: number, dueOn: string | null, timeZone: string | null }> {
  const row = await db('assignments').where({ id, assigned_by: teacherId })
    .first('id', db.raw('DATE_FORMAT(due_on, \'%Y-%m-%d\') AS due_on'), 'time_zone')
  if (!row) throw notFound('Assignment')
  return { id: Number(row.id), dueOn: row.due_on, timeZone: row.time_zone }
}

/** Whether the student is in one of the teacher's classes: the students a teacher may assign to directly. */
async function teachesStudent(db: Db, teacherId: number, studentId: number): Promise<boolean> {
  return Boolean(await db('class_members as m').join('classes as c', 'c.id', 'm.class_id')
    .where({ 'm.student_id': studentId, 'c.teacher_id': teacherId }).first('m.student_id'))
}

export interface AssignmentTarget {
  setTitle: string
  classId: number | null
  studentId: number | null
  /** Students the assignment reaches now, for the e-mail. */
  students: { id: number, name: string, email: string }[]
}

/** Checks that the teacher owns the set and the class (or teaches the student); 404 for what is not theirs, 409 for what is archived. */
export async function assignmentTarget(db: Db, teacherId: number, input: { drillSetId: number, classId?: number, studentId?: number }): Promise<AssignmentTarget> {
  const set = await db('drill_sets').where({ id: input.drillSetId, owner_id: teacherId }).first('title', 'archived_at')
  if (!set) throw notFound('Drill set')
  if (set.archived_at) throw createError({ statusCode: 409, statusMessage: 'Conflict', message: 'drillSetId: This drill set is archived' })
  if (input.classId !== undefined) {
    const cls = await db('classes').where({ id: input.classId, teacher_id: teacherId }).first('archived_at')
    if (!cls) throw notFound('Class')
    if (cls.archived_at) throw createError({ statusCode: 409, statusMessage: 'Conflict', message: 'classId: This class is archived' })
    const students = await db('class_members as m').join('users as u', 'u.id', 'm.student_id').where('m.class_id', input.classId).select('u.id', 'u.name', 'u.email')
    return { setTitle: set.title, classId: input.classId, studentId: null, students: students.map(s => ({ id: Number(s.id), name: s.name, email: s.email })) }
  }
  const studentId = input.studentId!
  if (!(await teachesStudent(db, teacherId, studentId))) throw notFound('Student')
  const student = await db('users').where({ id: studentId }).first('id', 'name', 'email')
  return { setTitle: set.title, classId: null, studentId, students: [{ id: Number(student.id), name: student.name, email: student.email }] }
}

/** Stores a new assignment; the e-mail to each student it reaches is queued in the same transaction. */
export async function createAssignment(db: Knex, teacher: { id: number, name: string }, input: AssignmentInput): Promise<number> {
  return db.transaction(async (trx) => {
    const target = await assignmentTarget(trx, teacher.id, input)
    const timeZone = input.timeZone ?? 'UTC'
    const [id] = await trx('assignments').insert({
      drill_set_id: input.drillSetId,
      class_id: target.classId,
      student_id: target.studentId,
      assigned_by: teacher.id,
      due_on: input.dueOn,
      time_zone: timeZone,
      due_at: endOfDueDay(input.dueOn, timeZone),
      note: input.note || null,
    })
    for (const student of target.students) {
      await queueMail(trx, {
        to: student.email,
        template: 'assignment',
        data: { studentName: student.name, teacherName: teacher.name, setTitle: target.setTitle, dueOn: input.dueOn, note: input.note || null, link: appLink('/student') },
      })
    }
    return Number(id)
  })
}
