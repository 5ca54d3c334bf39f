// Signs the account out on every browser and device, this one included.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const ended = await endSessionsOf(user.id)
  await clearUserSession(event)
  return { ended }
})
