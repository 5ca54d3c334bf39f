import type { H3Event } from 'h3'
import type { z } from 'zod'

/** A 400 that names each failing field, e.g. "email: Enter a valid e-mail address". */
function invalid(error: z.ZodError, what: string): Error {
  const issues = error.issues.map(issue => ({ path: issue.path.join('.') || what, message: issue.message }))
  return createError({
    statusCode: 400,
    statusMessage: 'Invalid input',
    message: issues.map(i => `${i.path}: ${i.message}`).join('; '),
    data: { issues },
  })
}

function check<S extends z.ZodType>(schema: S, value: unknown, what: string): z.infer<S> {
  const parsed = schema.safeParse(value)
  if (!parsed.success) throw invalid(parsed.error, what)
  return parsed.data
}

/** The largest body any route accepts: a 20,000-event attempt is about 1 MB of JSON. */
const MAX_BODY_BYTES = 2 * 1024 * 1024

export async function validBody<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.infer<S>> {
  const length = Number(getRequestHeader(event, 'content-length') ?? 0)
  if (length > MAX_BODY_BYTES) {
    throw createError({ statusCode: 413, statusMessage: 'Payload too large', message: `body: larger than ${MAX_BODY_BYTES / 1024 / 1024} MB` })
  }
  let body: unknown
  try {
    body = await readBody(event)
  }
  catch {
    throw createError({ statusCode: 400, statusMessage: 'Invalid input', message: 'body: not valid JSON' })
  }
  return check(schema, body ?? {}, 'body')
}

export function validQuery<S extends z.ZodType>(event: H3Event, schema: S): z.infer<S> {
  return check(schema, getQuery(event), 'query')
}

export function validParams<S extends z.ZodType>(event: H3Event, schema: S): z.infer<S> {
  return check(schema, getRouterParams(event, { decode: true }), 'params')
}
