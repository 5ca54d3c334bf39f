import { z } from 'zod'

const Query = z.object({ archived: z.enum(['true', 'false']).optional() })

export default defineEventHandler(async (event) => {
  const teacher = await requireRole(event, 'teacher')
  const { archived } = validQuery(event, Query)
  return { drillSets: await describeDrillSets(useDb(), teacher.id, { archived: archived === undefined ? undefined : archived === 'true' }) }
})
