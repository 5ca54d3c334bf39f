export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  return { account: await loadAccount(useDb(), user.id) }
})
