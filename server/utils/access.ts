// Who may see what. Every query that returns studio data goes through one of these.
import type { Knex } from 'knex'
import type { User } from '#auth-utils'

/** Students a teacher teaches: members of the teacher's classes and students given an assignment directly. */
export function taughtStudentIds(db: Knex, teacherId: number): Knex.QueryBuilder {
  return db.select('cm.student_id').from('class_members as cm').join('classes as c', 'c.id', 'cm.class_id').where('c.teacher_id', teacherId)
    .union(db.select('a.student_id').from('assignments as a').where('a.assigned_by', teacherId).whereNotNull('a.student_id'))
}

/** Assignments that reach a student, directly or through one of the student's classes. */
export function assignmentsOfStudent(db: Knex, studentId: number): Knex.QueryBuilder {
  // Grouped, so that conditions chained on later apply to both branches.
  return db('assignments as a').where(q => q
    .where('a.student_id', studentId)
    .orWhereIn('a.class_id', db.select('class_id').from('class_members').where('student_id', studentId)))
}

/** Ids of the drills a user may open. */
export function visibleDrillIds(db: Knex, user: User): Knex.QueryBuilder {
  if (user.role === 'admin') return db.select('id').from('drills')
  if (user.role === 'teacher') {
    return db.select('id').from('drills').where(q => q.where('owner_id', user.id).orWhere('is_public', true))
  }
  return db.select('id').from('drills').where('is_public', true)
    .union(
      db.select('dsi.drill_id').from('drill_set_items as dsi')
        .whereIn('dsi.drill_set_id', assignmentsOfStudent(db, user.id).clone().clearSelect().select('a.drill_set_id')),
    )
}

/** Whether `user` may read the attempts of `studentId`. */
export async function mayReadStudent(db: Knex, user: User, studentId: number): Promise<boolean> {
  if (user.role === 'admin' || user.id === studentId) return true
  if (user.role !== 'teacher') return false
  const row = await db.from(taughtStudentIds(db, user.id).as('t')).where('t.student_id', studentId).first()
  return Boolean(row)
}
