// `npm run mail:weekly [-- --week YYYY-MM-DD]`: queues the guardians' weekly summaries now, for the last
// complete week (Monday to Sunday in each student's own time zone, UTC when unknown) or the week holding
// the given day, in the database named by NUXT_DB_*; links start with NUXT_APP_URL. The running app's
// outbox worker sends them. A week already queued for a student is skipped, so running this twice sends
// nothing twice. `weekStart` in the output is the week asked for, or the last one complete in UTC.
import { parseArgs } from 'node:util'
import knex from 'knex'
import config from '../knexfile'
import { queueWeeklySummaries } from '../server/utils/weekly'

const { values } = parseArgs({ options: { week: { type: 'string' } } })
if (values.week !== undefined && !/^\d{4}-\d{2}-\d{2}$/.test(values.week)) {
  console.error('--week: give a day as YYYY-MM-DD')
  process.exit(2)
}
const db = knex(config)
try {
  const run = await queueWeeklySummaries(db, {
    appUrl: process.env.NUXT_APP_URL ?? 'http://127.0.0.1:3000',
    week: values.week,
  })
  console.log(JSON.stringify(run))
  console.error(`week of ${run.weekStart}: ${run.queued} summaries queued, ${run.alreadyQueued} were already queued`)
}
finally {
  await db.destroy()
}
