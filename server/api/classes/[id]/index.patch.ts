import { ClassPatch } from '#shared/types/classes'
import { IdParams } from '#shared/types/drillSet'

export default defineEventHandler(async (event) => {
  const teacher = await requireRole(event, 'teacher')
  const { id } = validParams(event, IdParams)
  const patch = await validBody(event, ClassPatch)
  const db = useDb()
  await ownClass(db, teacher.id, id)
  const changes: Record<string, unknown> = {}
  if (patch.name !== undefined) changes.name = patch.name
  if (patch.archived !== undefined) changes.archived_at = patch.archived ? new Date() : null
  if (Object.keys(changes).length) await db('classes').where({ id, teacher_id: teacher.id }).update(changes)
  return { class: await ownClass(db, teacher.id, id) }
})
