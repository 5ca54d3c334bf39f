import { AttemptListQuery } from '#shared/types/attempt'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'student', 'teacher', 'admin')
  const query = validQuery(event, AttemptListQuery)
  return listAttempts(useDb(), user, query)
})
