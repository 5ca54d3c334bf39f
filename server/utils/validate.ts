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

/** The body was read and bounded by server/middleware/01.requests.ts before the route ran. */
export async function validBody<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.infer<S>> {
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

/** Text fields of a multipart upload; an empty field counts as absent, as a form leaves unchosen selects empty. */
export function validFields<S extends z.ZodType>(fields: Record<string, string>, schema: S): z.infer<S> {
  return check(schema, Object.fromEntries(Object.entries(fields).filter(([, v]) => v !== '')), 'fields')
}
