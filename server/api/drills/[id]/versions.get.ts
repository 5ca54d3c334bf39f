import { DrillIdParams } from '#shared/types/drill'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'teacher', 'admin')
  const { id } = validParams(event, DrillIdParams)
  const db = useDb()
  await visibleDrill(db, user, id)
  return { versions: await drillVersions(db, id) }
})
