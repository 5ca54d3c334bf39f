import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  // One row per signed-in browser: the sealed cookie names its row, and a cookie whose row is gone is signed out.
  await knex.schema.createTable('sessions', (t) => {
    t.specificType('id', 'CHAR(43)').primary()
    t.bigInteger('user_id').unsigned().notNullable().references('users.id').onDelete('CASCADE')
    t.timestamp('created_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
    t.timestamp('last_seen_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
    t.timestamp('expires_at', { precision: 3 }).notNullable()
    t.index(['user_id'])
  })
  // rate-limiter-flexible's MySQL store, shared by every app instance (its own table layout).
  await knex.schema.createTable('rate_limits', (t) => {
    t.string('key', 255).primary()
    t.integer('points').notNullable().defaultTo(0)
    t.bigInteger('expire').unsigned().nullable()
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('rate_limits')
  await knex.schema.dropTable('sessions')
}
