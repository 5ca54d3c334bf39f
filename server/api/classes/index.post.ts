import { ClassInput } from '#shared/types/classes'

export default defineEventHandler(async (event) => {
  const teacher = await requireRole(event, 'teacher')
  const { name } = await validBody(event, ClassInput)
  const created = await createClass(useDb(), teacher.id, name)
  setResponseStatus(event, 201)
  return created
})
