import type { Knex } from 'knex'

// The IANA time zone of the user's browser at their latest sign-in, so a student's practice days are
// their own (a late-evening attempt counts on that evening) on every page, server-rendered ones too.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('users', (t) => {
    t.string('time_zone', 64).nullable()
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('users', (t) => {
    t.dropColumn('time_zone')
  })
}
