import type { H3Event } from 'h3'

const BODY_METHODS = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])
/** Routes that take a file upload (multipart/form-data); every other state-changing route takes JSON only. */
export const UPLOAD_ROUTES = new Set(['/api/drills/import'])

export function hasBody(event: H3Event): boolean {
  const length = getRequestHeader(event, 'content-length')
  return BODY_METHODS.has(event.method) && (Boolean(getRequestHeader(event, 'transfer-encoding')) || (length !== undefined && length !== '0'))
}

export function isStateChanging(event: H3Event): boolean {
  return BODY_METHODS.has(event.method)
}

export function routePath(event: H3Event): string {
  return event.path.split('?')[0]!
}

function tooLarge(limit: number): Error {
  return createError({ statusCode: 413, statusMessage: 'Payload too large', message: `body: larger than ${Math.round(limit / 1024 / 1024 * 10) / 10} MB` })
}

/**
 * Reads the request body counting the bytes that actually arrive (a chunked body declares no length)
 * and stops at `limit`. The bytes are left where h3's readBody and readMultipartFormData look first.
 */
export async function readBoundedBody(event: H3Event, limit: number): Promise<void> {
  if (Number(getRequestHeader(event, 'content-length') ?? 0) > limit) throw tooLarge(limit)
  const chunks: Buffer[] = []
  let size = 0
  for await (const chunk of event.node.req) {
    size += (chunk as Buffer).length
    if (size > limit) {
      // The rest is never read: close the connection rather than drain it.
      setResponseHeader(event, 'connection', 'close')
      throw tooLarge(limit)
    }
    chunks.push(chunk as Buffer)
  }
  ;(event as H3Event & { _requestBody?: Buffer })._requestBody = Buffer.concat(chunks)
}

/** A browser names the site a request comes from; anything but our own origin is refused for state changes. */
export function isCrossSite(event: H3Event): boolean {
  const fetchSite = getRequestHeader(event, 'sec-fetch-site')
  if (fetchSite && fetchSite !== 'same-origin' && fetchSite !== 'none') return true
  const origin = getRequestHeader(event, 'origin')
  if (!origin) return false
  if (origin === 'null') return true
  try {
    return new URL(origin).host !== getRequestHost(event, { xForwardedHost: false })
  }
  catch {
    return true
  }
}
