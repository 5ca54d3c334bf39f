import { StudentParams } from '#shared/types/progress'

// A teacher sends one of their own students a link to choose a new password.
export default defineEventHandler(async (event) => {
  const teacher = await requireRole(event, 'teacher', 'admin')
  const { id } = validParams(event, StudentParams)
  const student = await requireTaughtStudent(useDb(), teacher, id)
  await sendPasswordReset(student.email, teacher.name)
  setResponseStatus(event, 202)
  return { message: `${student.name} will receive a link to choose a new password. It works for one hour.` }
})
