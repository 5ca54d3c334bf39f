export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'student', 'teacher')
  const db = useDb()
  const assignments = user.role === 'student'
    ? await describeAssignments(db, assignmentsOfStudent(db, user.id), user.id)
    : await describeAssignments(db, db('assignments as a').where('a.assigned_by', user.id))
  return { assignments }
})
