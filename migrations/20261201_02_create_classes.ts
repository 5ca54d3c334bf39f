import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('classes', (t) => {
    t.bigIncrements('id')
    t.bigInteger('teacher_id').unsigned().notNullable().references('users.id').onDelete('CASCADE')
    t.string('name', 120).notNullable()
    t.string('join_code', 16).notNullable().unique()
    t.timestamp('created_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
    t.index(['teacher_id'])
  })
  await knex.schema.createTable('class_members', (t) => {
    t.bigInteger('class_id').unsigned().notNullable().references('classes.id').onDelete('CASCADE')
    t.bigInteger('student_id').unsigned().notNullable().references('users.id').onDelete('CASCADE')
    t.timestamp('joined_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
    t.primary(['class_id', 'student_id'])
    t.index(['student_id'])
  })
  await knex.schema.createTable('invitations', (t) => {
    t.bigIncrements('id')
    t.bigInteger('class_id').unsigned().notNullable().references('classes.id').onDelete('CASCADE')
    t.string('email', 254).notNullable()
    // Only a hash of the one-time token is stored, so a database leak opens no accounts.
    t.specificType('token_hash', 'CHAR(64)').notNullable().unique()
    t.timestamp('expires_at', { precision: 3 }).notNullable()
    t.timestamp('accepted_at', { precision: 3 }).nullable()
    t.timestamp('created_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
    t.index(['class_id', 'email'])
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('invitations')
  await knex.schema.dropTable('class_members')
  await knex.schema.dropTable('classes')
}
