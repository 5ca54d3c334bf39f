import { UPLOAD_LIMITS } from '#shared/engine'
import { DrillImportFields } from '#shared/types/drill'

/** Reads a MIDI or MusicXML file into a drill preview; nothing is stored until the teacher saves. */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'teacher')
  const { file, fields } = await readUpload(event, UPLOAD_LIMITS.bytes)
  const { track, ...options } = validFields(fields, DrillImportFields)
  if (!file) throw createError({ statusCode: 400, statusMessage: 'Invalid input', message: 'file: choose a MIDI or MusicXML file to upload' })
  return previewDrillFile(file.bytes, { ...options, tracks: track, fileName: file.name })
})
