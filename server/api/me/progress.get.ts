import { ProgressQuery } from '#shared/types/progress'

/** The signed-in student's own progress: every drill played and the practice log, or one drill's series with `?drill=`. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'student')
  const query = validQuery(event, ProgressQuery)
  return studentProgress(event, user, user.id, query)
})
