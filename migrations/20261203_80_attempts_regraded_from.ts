import type { Knex } from 'knex'

// `npm run regrade` recomputes stored grades with a newer engine; the version an attempt was first graded with stays on record.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('attempts', (t) => {
    t.string('regraded_from_version', 20).nullable()
    t.timestamp('regraded_at', { precision: 3 }).nullable()
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('attempts', (t) => {
    t.dropColumn('regraded_from_version')
    t.dropColumn('regraded_at')
  })
}
