import { HabitsQuery, StudentParams } from '#shared/types/progress'

/** Per-finger habits and unplanned position changes across drills, for the student's teacher or the student. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const { id } = validParams(event, StudentParams)
  const { range } = validQuery(event, HabitsQuery)
  const db = useDb()
  const student = await readableStudent(db, user, id)
  return studentHabits(db, user, student, range)
})
