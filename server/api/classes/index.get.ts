export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'student', 'teacher')
  const db = useDb()
  if (user.role === 'student') {
    const classes = await db('classes as c').join('class_members as m', 'm.class_id', 'c.id').join('users as t', 't.id', 'c.teacher_id')
      .where('m.student_id', user.id).orderBy('c.name').select('c.id', 'c.name', 't.name as teacher_name')
    return { classes: classes.map(c => ({ id: Number(c.id), name: c.name, teacherName: c.teacher_name })) }
  }
  const classes = await db('classes').where('teacher_id', user.id).orderBy('name').select('id', 'name', 'join_code')
  const members = await db('class_members as m').join('users as u', 'u.id', 'm.student_id')
    .whereIn('m.class_id', classes.map(c => c.id)).orderBy('u.name').select('m.class_id', 'u.id', 'u.name', 'u.email')
  return {
    classes: classes.map(c => ({
      id: Number(c.id),
      name: c.name,
      joinCode: c.join_code,
      students: members.filter(m => m.class_id === c.id).map(m => ({ id: Number(m.id), name: m.name, email: m.email })),
    })),
  }
})
