// A student's own assignments (their classes' and their own), each drill with best and latest score against its targets.
export default defineEventHandler(async (event) => {
  const student = await requireRole(event, 'student')
  const db = useDb()
  return { assignments: await describeAssignments(db, assignmentsOfStudent(db, student.id), student.id) }
})
