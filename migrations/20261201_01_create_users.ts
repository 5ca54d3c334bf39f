import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('users', (t) => {
    t.bigIncrements('id')
    t.string('email', 254).notNullable().unique()
    t.string('name', 120).notNullable()
    t.string('password_hash', 255).nullable()
    t.enum('role', ['teacher', 'student', 'admin']).notNullable()
    t.string('guardian_email', 254).nullable()
    t.timestamp('created_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
    t.index(['role'])
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('users')
}
