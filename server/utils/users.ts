import type { Knex } from 'knex'
import type { Role } from '#shared/types/account'

/** A new account; an e-mail that already has one is a 409 naming the field. */
export async function insertUser(db: Knex | Knex.Transaction, input: { email: string, name: string, passwordHash: string, role: Exclude<Role, 'admin'> }): Promise<number> {
  try {
    const [id] = await db('users').insert({ email: input.email, name: input.name, password_hash: input.passwordHash, role: input.role })
    return Number(id)
  }
  catch (error) {
    if ((error as { code?: string }).code === 'ER_DUP_ENTRY') {
      throw createError({ statusCode: 409, statusMessage: 'Conflict', message: 'email: An account with this e-mail already exists' })
    }
    throw error
  }
}
