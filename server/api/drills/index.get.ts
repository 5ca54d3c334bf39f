import { DrillListQuery } from '#shared/types/drill'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const query = validQuery(event, DrillListQuery)
  return listDrills(useDb(), user, query)
})
