import { DrillIdParams } from '#shared/types/drill'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'teacher')
  const { id } = validParams(event, DrillIdParams)
  const db = useDb()
  const drill = await duplicateDrill(db, user, await visibleDrill(db, user, id))
  setResponseStatus(event, 201)
  return { id: drill.id, drill }
})
