import { IdParams } from '#shared/types/drillSet'

export default defineEventHandler(async (event) => {
  const teacher = await requireRole(event, 'teacher')
  const { id } = validParams(event, IdParams)
  const copy = await duplicateDrillSet(useDb(), teacher.id, id)
  setResponseStatus(event, 201)
  return { id: copy }
})
