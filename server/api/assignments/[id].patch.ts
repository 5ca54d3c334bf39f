import { AssignmentPatch } from '#shared/types/assignment'
import { IdParams } from '#shared/types/drillSet'

export default defineEventHandler(async (event) => {
  const teacher = await requireRole(event, 'teacher')
  const { id } = validParams(event, IdParams)
  const patch = await validBody(event, AssignmentPatch)
  const db = useDb()
  const current = await ownAssignment(db, teacher.id, id)
  const changes: Record<string, unknown> = {}
  if (patch.note !== undefined) changes.note = patch.note || null
  if (patch.dueOn !== undefined || patch.timeZone !== undefined) {
    const dueOn = patch.dueOn ?? current.dueOn
    const timeZone = patch.timeZone ?? current.timeZone ?? 'UTC'
    if (dueOn) Object.assign(changes, { due_on: dueOn, time_zone: timeZone, due_at: endOfDueDay(dueOn, timeZone) })
  }
  if (Object.keys(changes).length) await db('assignments').where({ id, assigned_by: teacher.id }).update(changes)
  const [assignment] = await describeAssignments(db, db('assignments as a').where('a.id', id))
  return { assignment }
})
