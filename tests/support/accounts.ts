// Accounts made straight in the test database, as the demo seed and create-admin do, for tests that need
// people the demo studio lacks (another teacher, an admin, a student of a class of their own).
import { randomUUID } from 'node:crypto'
import type { Role } from '../../shared/types/account'
import { hashPassword } from '../../scripts/lib/password'
import { Client, testDb } from './server'

export const TEST_PASSWORD = 'tidy-octave-climb-7'

let hashed: Promise<string> | undefined

export interface TestAccount { id: number, email: string, client: Client }

/** A new account of `role`, signed in; `domain` other than the demo's keeps it out of the local mail box. */
export async function makeAccount(role: Role, name = `Test ${role}`, domain = 'evenhand.test'): Promise<TestAccount> {
  hashed ??= hashPassword(TEST_PASSWORD)
  const email = `${role}-${randomUUID()}@${domain}`
  const [id] = await testDb()('users').insert({ email, name, role, password_hash: await hashed })
  const client = await new Client().signIn(email, TEST_PASSWORD)
  return { id: Number(id), email, client }
}

/** The addresses a request from this machine may arrive from, as the server names them. */
export const LOOPBACK_ADDRESSES = ['127.0.0.1', '::ffff:127.0.0.1', '::1']
