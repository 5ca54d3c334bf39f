import { AttemptInput } from '#shared/types/attempt'

export default defineEventHandler(async (event) => {
  const student = await requireRole(event, 'student')
  const input = await validBody(event, AttemptInput)
  await spend(event, 'attempts', String(student.id), 'Too many attempts in a minute; the attempt is kept and sent again shortly')
  const { attempt, created } = await saveAttempt(useDb(), student, input)
  setResponseStatus(event, created ? 201 : 200)
  return { attempt }
})
