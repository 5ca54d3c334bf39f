import { DrillInput } from '#shared/types/drill'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'teacher')
  const input = await validBody(event, DrillInput)
  const drill = await createDrill(useDb(), user, input)
  setResponseStatus(event, 201)
  return { id: drill.id, drill }
})
