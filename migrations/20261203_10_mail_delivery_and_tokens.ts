import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  // A worker claims a row for a while before sending it, so two app instances never send one message;
  // a worker that dies mid-send lets its claim lapse and another picks the row up.
  await knex.schema.alterTable('mail_outbox', (t) => {
    t.string('template', 40).nullable()
    t.string('claimed_by', 80).nullable()
    t.timestamp('claimed_until', { precision: 3 }).nullable()
    // Sent as the List-Unsubscribe header of mail that can be stopped (the weekly summary).
    t.string('unsubscribe_link', 500).nullable()
  })
  // One-time links (password reset, e-mail change, invitations, unsubscribe): only the token's SHA-256 is kept.
  await knex.schema.createTable('one_time_tokens', (t) => {
    t.bigIncrements('id')
    t.string('kind', 32).notNullable()
    t.specificType('token_hash', 'CHAR(64)').notNullable().unique()
    t.bigInteger('user_id').unsigned().nullable().references('users.id').onDelete('CASCADE')
    // What the link is about beyond its user: the new address of an e-mail change, an invitation's id.
    t.string('subject', 254).nullable()
    t.timestamp('expires_at', { precision: 3 }).notNullable()
    t.timestamp('used_at', { precision: 3 }).nullable()
    t.timestamp('created_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
    t.index(['user_id', 'kind'])
  })
  await knex.schema.alterTable('users', (t) => {
    // Set when the guardian follows the summary's unsubscribe link; cleared when the address changes.
    t.timestamp('guardian_summary_stopped_at', { precision: 3 }).nullable()
  })
  // One row per student and week once that week's summary is queued, so a week is never sent twice.
  await knex.schema.createTable('weekly_summaries', (t) => {
    t.bigInteger('student_id').unsigned().notNullable().references('users.id').onDelete('CASCADE')
    t.date('week_start').notNullable()
    t.bigInteger('outbox_id').unsigned().nullable().references('mail_outbox.id').onDelete('SET NULL')
    t.timestamp('queued_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
    t.primary(['student_id', 'week_start'])
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('weekly_summaries')
  await knex.schema.alterTable('users', (t) => {
    t.dropColumn('guardian_summary_stopped_at')
  })
  await knex.schema.dropTable('one_time_tokens')
  await knex.schema.alterTable('mail_outbox', (t) => {
    t.dropColumn('template')
    t.dropColumn('claimed_by')
    t.dropColumn('claimed_until')
    t.dropColumn('unsubscribe_link')
  })
}
