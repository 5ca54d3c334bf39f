import { GuardianInput } from '#shared/types/account'
import { StudentParams } from '#shared/types/progress'

// A teacher sets or clears the guardian address of one of their own students.
export default defineEventHandler(async (event) => {
  const teacher = await requireRole(event, 'teacher', 'admin')
  const { id } = validParams(event, StudentParams)
  const { guardianEmail } = await validBody(event, GuardianInput)
  const db = useDb()
  await requireTaughtStudent(db, teacher, id)
  await setGuardianEmail(db, id, guardianEmail)
  return { guardianEmail }
})
