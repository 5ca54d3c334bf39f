import { z } from 'zod'

const Params = z.object({ id: z.coerce.number().int().positive().max(Number.MAX_SAFE_INTEGER) })

// An admin signs an account out everywhere, e.g. after a lost device.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  const { id } = validParams(event, Params)
  if (!(await useDb()('users').where({ id }).first('id'))) throw createError({ statusCode: 404, statusMessage: 'Not found', message: 'User not found' })
  return { ended: await endSessionsOf(id) }
})
