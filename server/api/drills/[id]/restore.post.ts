import { DrillIdParams } from '#shared/types/drill'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'teacher')
  const { id } = validParams(event, DrillIdParams)
  const db = useDb()
  return { drill: await setArchived(db, await ownDrill(db, user, id), false) }
})
