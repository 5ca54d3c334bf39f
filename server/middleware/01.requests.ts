// Before any route runs: state-changing API calls come from our own pages, as JSON (or multipart for an
// upload), within the body limit counted on the bytes read. Cross-site forms can send neither JSON nor an Origin of ours.
export default defineEventHandler(async (event) => {
  const path = routePath(event)
  if (!path.startsWith('/api/') || !isStateChanging(event)) return
  if (isCrossSite(event)) {
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: 'origin: Requests from other sites are refused' })
  }
  if (!hasBody(event)) return
  const type = (getRequestHeader(event, 'content-type') ?? '').split(';')[0]!.trim().toLowerCase()
  const upload = UPLOAD_ROUTES.has(path) && type === 'multipart/form-data'
  if (type !== 'application/json' && !upload) {
    throw createError({ statusCode: 415, statusMessage: 'Unsupported media type', message: `body: send application/json${UPLOAD_ROUTES.has(path) ? ' or multipart/form-data' : ''}` })
  }
  const { limits } = useRuntimeConfig()
  await readBoundedBody(event, Number(upload ? limits.uploadBytes : limits.bodyBytes))
})
