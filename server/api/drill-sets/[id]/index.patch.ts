import { DrillSetPatch, IdParams } from '#shared/types/drillSet'

export default defineEventHandler(async (event) => {
  const teacher = await requireRole(event, 'teacher')
  const { id } = validParams(event, IdParams)
  const patch = await validBody(event, DrillSetPatch)
  const db = useDb()
  await db.transaction(async (trx) => {
    await ownDrillSet(trx, teacher.id, id, true)
    const changes: Record<string, unknown> = {}
    if (patch.title !== undefined) changes.title = patch.title
    if (patch.archived !== undefined) changes.archived_at = patch.archived ? new Date() : null
    if (Object.keys(changes).length) await trx('drill_sets').where({ id }).update(changes)
    if (patch.items) await writeItems(trx, teacher.id, id, patch.items)
  })
  return { drillSet: await describeDrillSet(db, teacher.id, id) }
})
