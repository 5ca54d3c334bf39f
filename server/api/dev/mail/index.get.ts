export default defineEventHandler(async (event) => {
  const dir = await requireDevMail(event)
  return { messages: await listDevMail(dir) }
})
