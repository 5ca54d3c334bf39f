export interface ClassView {
  id: number
  name: string
  teacherName: string
  /** Only the class's teacher sees the join code and the roster. */
  joinCode: string | null
  archived: boolean
  students: { id: number, name: string, email: string }[]
}

export default defineEventHandler(async (event): Promise<{ classes: ClassView[] }> => {
  const user = await requireRole(event, 'student', 'teacher')
  const db = useDb()
  const isTeacher = user.role === 'teacher'
  const classes: { id: number, name: string, join_code: string, archived_at: Date | null, teacher_name: string }[] = await db('classes as c')
    .join('users as t', 't.id', 'c.teacher_id')
    .modify(q => isTeacher
      ? q.where('c.teacher_id', user.id)
      // A student no longer sees a class once its teacher archives it.
      : q.join('class_members as m', 'm.class_id', 'c.id').where('m.student_id', user.id).whereNull('c.archived_at'))
    .orderBy('c.name').select('c.id', 'c.name', 'c.join_code', 'c.archived_at', 't.name as teacher_name')
  const members: { class_id: number, id: number, name: string, email: string }[] = isTeacher
    ? await db('class_members as m').join('users as u', 'u.id', 'm.student_id')
        .whereIn('m.class_id', classes.map(c => c.id)).orderBy('u.name').select('m.class_id', 'u.id', 'u.name', 'u.email')
    : []
  return {
    classes: classes.map(c => ({
      id: Number(c.id),
      name: c.name,
      teacherName: c.teacher_name,
      joinCode: isTeacher ? c.join_code : null,
      archived: c.archived_at !== null,
      students: members.filter(m => m.class_id === c.id).map(m => ({ id: Number(m.id), name: m.name, email: m.email })),
    })),
  }
})
