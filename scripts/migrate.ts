// Brings the database named by NUXT_DB_* up to the latest migration.
import knex from 'knex'
import config from '../knexfile'

const db = knex(config)
try {
  const [batch, done] = await db.migrate.latest()
  console.error(done.length ? `migrated (batch ${batch}): ${done.join(', ')}` : 'database schema is up to date')
}
finally {
  await db.destroy()
}
