import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  // Mail is queued here in the same transaction as the change that causes it; a worker sends it,
  // so a mail server outage delays messages but loses none.
  await knex.schema.createTable('mail_outbox', (t) => {
    t.bigIncrements('id')
    t.string('to_email', 254).notNullable()
    t.string('subject', 200).notNullable()
    t.text('text_body').notNullable()
    t.text('html_body').nullable()
    t.enum('status', ['queued', 'sent', 'failed']).notNullable().defaultTo('queued')
    t.integer('tries').unsigned().notNullable().defaultTo(0)
    t.text('last_error').nullable()
    t.timestamp('send_after', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
    t.timestamp('sent_at', { precision: 3 }).nullable()
    t.timestamp('created_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
    t.index(['status', 'send_after'])
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('mail_outbox')
}
