import { IdParams } from '#shared/types/drillSet'

export default defineEventHandler(async (event) => {
  const teacher = await requireRole(event, 'teacher')
  const { id } = validParams(event, IdParams)
  return { class: await classDetail(useDb(), teacher.id, id) }
})
