import { z } from 'zod'
import type { DrillRow } from '../../utils/drills'
import { DrillKind } from '#shared/types/drill'

const Query = z.object({
  kind: DrillKind.optional(),
})

export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const { kind } = validQuery(event, Query)
  const db = useDb()
  const rows: DrillRow[] = await db('drills')
    .whereIn('id', visibleDrillIds(db, user))
    .modify(q => kind && q.where({ kind }))
    .orderBy([{ column: 'kind' }, { column: 'title' }])
  return { drills: rows.map(toDrillSummary) }
})
