import { DrillIdParams } from '#shared/types/drill'

export interface DrillTarget {
  assignmentId: number
  drillSetTitle: string
  dueAt: string | null
  note: string | null
  targetTempoBpm: number | null
  targetScore: number | null
}

export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const { id } = validParams(event, DrillIdParams)
  const db = useDb()
  const row = await visibleDrill(db, user, id)

  // A student sees what each assignment asks of this drill; the practice page never goes past the target tempo.
  const targets: DrillTarget[] = user.role !== 'student'
    ? []
    : (await assignmentsOfStudent(db, user.id).clone()
        .join('drill_sets as ds', 'ds.id', 'a.drill_set_id')
        .join('drill_set_items as dsi', 'dsi.drill_set_id', 'ds.id')
        .where('dsi.drill_id', id)
        .orderBy('a.due_at')
        .select('a.id', 'ds.title', 'a.due_at', 'a.note', 'dsi.target_tempo_bpm', 'dsi.target_score'))
        .map((r: Record<string, unknown>) => ({
          assignmentId: Number(r.id),
          drillSetTitle: String(r.title),
          dueAt: r.due_at ? new Date(r.due_at as string).toISOString() : null,
          note: (r.note as string | null) ?? null,
          targetTempoBpm: (r.target_tempo_bpm as number | null) ?? null,
          targetScore: (r.target_score as number | null) ?? null,
        }))
  return { drill: toDrillDetail(row), targets }
})
