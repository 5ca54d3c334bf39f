import { DrillSetInput } from '#shared/types/drillSet'

export default defineEventHandler(async (event) => {
  const teacher = await requireRole(event, 'teacher')
  const { title, items } = await validBody(event, DrillSetInput)
  const id = await createDrillSet(useDb(), teacher.id, title, items)
  setResponseStatus(event, 201)
  return { id }
})
