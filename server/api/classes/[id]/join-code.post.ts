import { IdParams } from '#shared/types/drillSet'

// A new code for the class; the old one stops working at once (students already in stay in).
export default defineEventHandler(async (event) => {
  const teacher = await requireRole(event, 'teacher')
  const { id } = validParams(event, IdParams)
  const db = useDb()
  await ownClass(db, teacher.id, id)
  return { joinCode: await regenerateJoinCode(db, id) }
})
