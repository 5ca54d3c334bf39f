export default defineEventHandler(async (event) => {
  const dir = await requireDevMail(event)
  const { id } = validParams(event, DevMailParams)
  return { message: await readDevMail(dir, id) }
})
