export default defineEventHandler(async (event) => {
  try {
    await useDb().raw('SELECT 1')
    return { db: 'ok' }
  }
  catch {
    setResponseStatus(event, 503)
    return { db: 'unavailable' }
  }
})
