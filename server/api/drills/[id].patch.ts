import { DrillIdParams, DrillPatch } from '#shared/types/drill'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'teacher')
  const { id } = validParams(event, DrillIdParams)
  const patch = await validBody(event, DrillPatch)
  const db = useDb()
  await ownDrill(db, user, id)
  return { drill: await updateDrill(db, user, id, patch) }
})
