// `npm run regrade`: regrades the attempts of the database named by NUXT_DB_* with the current engine.
import knex from 'knex'
import config from '../knexfile'
import { regradeAttempts } from './lib/regrade'

const db = knex(config)
try {
  const { regraded, engineVersion } = await regradeAttempts(db)
  console.log(`regraded ${regraded} attempt${regraded === 1 ? '' : 's'} with engine ${engineVersion}`)
}
finally {
  await db.destroy()
}
