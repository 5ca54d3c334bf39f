// The same scrypt hashing nuxt-auth-utils uses with its default options, for accounts made outside the server.
import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'

const hash = new Hash(new Scrypt({}))

export function hashPassword(password: string): Promise<string> {
  return hash.make(password)
}
