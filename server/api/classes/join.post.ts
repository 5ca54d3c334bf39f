import { JoinInput } from '#shared/types/classes'

export default defineEventHandler(async (event) => {
  const student = await requireRole(event, 'student')
  const { code } = await validBody(event, JoinInput)
  const db = useDb()
  const cls = await classByCode(db, code)
  await addMember(db, cls.id, student.id)
  return { class: cls }
})
