import { HabitsQuery } from '#shared/types/progress'

/** Per-finger habits and unplanned position changes across drills, for the student's teacher or the student. */
export default defineEventHandler(async (event) => {
  const { user, db, student, query } = await studentRequest(event, HabitsQuery)
  return studentHabits(db, user, student, query.range)
})
