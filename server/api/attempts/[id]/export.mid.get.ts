import { exportAttemptSmf } from '#shared/engine'
import { AttemptParams } from '../../../utils/attempts'

/** The attempt as played, as a Standard MIDI File at the tempo it was practised at. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const { id } = validParams(event, AttemptParams)
  const db = useDb()
  const row = await db('attempts as a').join('drills as d', 'd.id', 'a.drill_id').where('a.id', id)
    .first('a.student_id', 'a.events', 'a.tempo_bpm', 'a.started_at', 'd.title')
  if (!row || !(await mayReadStudent(db, user, Number(row.student_id)))) {
    throw createError({ statusCode: 404, statusMessage: 'Not found', message: 'Attempt not found' })
  }
  const day = new Date(row.started_at).toISOString().slice(0, 10)
  const title = `${row.title} ${day}`
  const bytes = exportAttemptSmf(parseJson(row.events), { tempoBpm: Number(row.tempo_bpm), title })
  const filename = `${title.replace(/[^\w -]+/g, '').trim().replace(/\s+/g, '-').toLowerCase() || 'attempt'}.mid`
  setResponseHeaders(event, {
    'content-type': 'audio/midi',
    'content-disposition': `attachment; filename="${filename}"`,
    'cache-control': 'private, no-store',
  })
  return Buffer.from(bytes)
})
