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
  const req = event.node.req
  const body = await new Promise<Buffer>((resolve, reject) => {
    const chunks: Buffer[] = []
    let size = 0
    const stop = (): void => {
      req.off('data', onData)
      req.off('end', onEnd)
      req.off('error', onError)
    }
    const onData = (chunk: Buffer): void => {
      size += chunk.length
      if (size <= limit) return void chunks.push(chunk)
      // Stop reading but leave the socket open long enough to answer; the connection closes after the reply.
      stop()
      req.pause()
      setResponseHeader(event, 'connection', 'close')
      reject(tooLarge(limit))
    }
    const onEnd = (): void => {
      stop()
      resolve(Buffer.concat(chunks))
    }
    const onError = (error: Error): void => {
      stop()
      reject(error)
    }
    req.on('data', onData).on('end', onEnd).on('error', onError)
  })
  ;(event as unknown as { _requestBody: Buffer })._requestBody = body
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
