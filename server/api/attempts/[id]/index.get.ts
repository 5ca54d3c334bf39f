import { AttemptParams } from '../../../utils/attempts'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const { id } = validParams(event, AttemptParams)
  const db = useDb()
  const attempt = await loadAttempt(db, id)
  // A hidden attempt answers like a missing one, so ids of other students' attempts reveal nothing.
  if (!attempt || !(await mayReadStudent(db, user, attempt.studentId))) {
    throw createError({ statusCode: 404, statusMessage: 'Not found', message: 'Attempt not found' })
  }
  const [drill, version, student] = await Promise.all([
    db('drills').where('id', attempt.drillId).first('title', 'meter', 'key_signature'),
    drillVersion(db, attempt.drillId, attempt.drillVersion),
    db('users').where('id', attempt.studentId).first('name'),
  ])
  return {
    attempt,
    student: { id: attempt.studentId, name: String(student?.name ?? '') },
    drill: { id: attempt.drillId, title: String(drill?.title ?? ''), version: attempt.drillVersion, hand: version?.hand, tempoBpm: version?.tempoBpm, meter: String(drill?.meter ?? '4/4'), notes: version?.notes ?? [] },
  }
})
