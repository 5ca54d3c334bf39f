// Seeds the demo studio into the database named by NUXT_DB_*; safe to run again.
import knex from 'knex'
import config from '../knexfile'

const db = knex(config)
try {
  await db.seed.run()
}
finally {
  await db.destroy()
}
