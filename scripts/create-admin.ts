// `npm run create-admin -- EMAIL "NAME"`: makes (or promotes) an admin account; admins never come from sign-up.
// The password comes from EVENHAND_ADMIN_PASSWORD, or a random one is made and printed once.
import { randomBytes } from 'node:crypto'
import knex from 'knex'
import config from '../knexfile'
import { Email, Password } from '../shared/types/account'
import { hashPassword } from './lib/password'

const [emailArg, ...nameParts] = process.argv.slice(2)
const email = Email.safeParse(emailArg)
if (!email.success) {
  console.error('usage: npm run create-admin -- EMAIL "NAME"  (EVENHAND_ADMIN_PASSWORD sets the password)')
  process.exit(2)
}
const given = process.env.EVENHAND_ADMIN_PASSWORD
const password = given ?? randomBytes(12).toString('base64url')
if (!Password.safeParse(password).success) {
  console.error('EVENHAND_ADMIN_PASSWORD must be 8 to 200 characters')
  process.exit(2)
}
const db = knex(config)
try {
  const row = { email: email.data, name: nameParts.join(' ') || 'Administrator', role: 'admin', password_hash: await hashPassword(password) }
  await db('users').insert(row).onConflict('email').merge(['role', 'password_hash'])
  console.log(given ? `admin ${email.data} is ready` : `admin ${email.data} is ready; password: ${password}`)
}
finally {
  await db.destroy()
}
