import { JoinInput } from '#shared/types/classes'

export default defineEventHandler(async (event) => {
  const student = await requireRole(event, 'student')
  const { code } = await validBody(event, JoinInput)
  const db = useDb()
  // Codes are short: wrong guesses are limited per student, so a code cannot be found by trying them all.
  const key = String(student.id)
  await refuseWhenSpent(event, 'joinCode', key, 'Too many wrong codes; wait a little and try again')
  const cls = await classByCode(db, code).catch(async (error: unknown) => {
    await spendQuietly(event, 'joinCode', key)
    throw error
  })
  await addMember(db, cls.id, student.id)
  return { class: cls }
})
