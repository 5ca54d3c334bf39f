import { randomBytes } from 'node:crypto'
import type { User } from '#auth-utils'

let standIn: Promise<string> | undefined

/**
 * The account when `password` is its password. An unknown e-mail is checked against a stand-in hash, so it
 * costs the same scrypt work as a known one and the answer's timing tells nothing.
 */
export async function checkPassword(email: string, password: string): Promise<User | null> {
  const row = await useDb()('users').where({ email }).first('id', 'email', 'name', 'role', 'password_hash')
  standIn ??= hashPassword(randomBytes(16).toString('hex'))
  const hash: string = row?.password_hash ?? await standIn
  const matches = await verifyPassword(hash, password)
  return row?.password_hash && matches ? { id: Number(row.id), email: row.email, name: row.name, role: row.role } : null
}
