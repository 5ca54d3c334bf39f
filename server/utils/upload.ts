import type { H3Event } from 'h3'

export interface Upload {
  file: { name: string, bytes: Uint8Array } | null
  fields: Record<string, string>
}

/** Room for the multipart boundaries, part headers and the short text fields beside the file. */
const MULTIPART_OVERHEAD_BYTES = 64 * 1024

const invalid = (message: string): Error => createError({ statusCode: 400, statusMessage: 'Invalid input', message })

/**
 * Reads a multipart upload of at most `maxFileBytes`. The request middleware has already read the
 * body counting the bytes that arrived (up to `limits.uploadBytes`, a 413 past it); a body over the
 * file limit but under that is a 400 that names the file limit.
 */
export async function readUpload(event: H3Event, maxFileBytes: number): Promise<Upload> {
  const contentType = getRequestHeader(event, 'content-type') ?? ''
  if (!/^multipart\/form-data;.*boundary=/i.test(contentType)) throw invalid('file: send the file as multipart/form-data')
  const body = await readRawBody(event, false)
  if (!body || body.length === 0) throw invalid('file: no file was sent')
  const tooLarge = `file: the file is over ${maxFileBytes / 1024 / 1024} MB`
  if (body.length > maxFileBytes + MULTIPART_OVERHEAD_BYTES) throw invalid(tooLarge)

  let form: FormData
  try {
    form = await new Response(new Uint8Array(body), { headers: { 'content-type': contentType } }).formData()
  }
  catch {
    throw invalid('file: the upload is not well-formed multipart/form-data')
  }
  const fields: Record<string, string> = {}
  let file: Upload['file'] = null
  for (const [name, value] of form.entries()) {
    if (typeof value === 'string') fields[name] = value
    else if (name === 'file') {
      if (value.size > maxFileBytes) throw invalid(tooLarge)
      file = { name: value.name, bytes: new Uint8Array(await value.arrayBuffer()) }
    }
  }
  return { file, fields }
}
