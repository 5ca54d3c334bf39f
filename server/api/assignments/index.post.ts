import { AssignmentInput } from '#shared/types/assignment'

export default defineEventHandler(async (event) => {
  const teacher = await requireRole(event, 'teacher')
  const input = await validBody(event, AssignmentInput)
  const id = await createAssignment(useDb(), teacher, input)
  setResponseStatus(event, 201)
  return { id }
})
