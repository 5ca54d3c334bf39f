import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('drill_sets', (t) => {
    t.bigIncrements('id')
    t.bigInteger('owner_id').unsigned().notNullable().references('users.id').onDelete('CASCADE')
    t.string('title', 160).notNullable()
    t.text('description').nullable()
    t.timestamp('created_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
    t.index(['owner_id'])
  })
  await knex.schema.createTable('drill_set_items', (t) => {
    t.bigIncrements('id')
    t.bigInteger('drill_set_id').unsigned().notNullable().references('drill_sets.id').onDelete('CASCADE')
    t.bigInteger('drill_id').unsigned().notNullable().references('drills.id').onDelete('CASCADE')
    t.integer('position').unsigned().notNullable()
    t.smallint('target_tempo_bpm').unsigned().nullable()
    t.tinyint('target_score').unsigned().nullable()
    t.unique(['drill_set_id', 'position'])
    t.index(['drill_id'])
  })
  await knex.schema.createTable('assignments', (t) => {
    t.bigIncrements('id')
    t.bigInteger('drill_set_id').unsigned().notNullable().references('drill_sets.id').onDelete('CASCADE')
    t.bigInteger('class_id').unsigned().nullable().references('classes.id').onDelete('CASCADE')
    t.bigInteger('student_id').unsigned().nullable().references('users.id').onDelete('CASCADE')
    t.bigInteger('assigned_by').unsigned().notNullable().references('users.id').onDelete('CASCADE')
    t.timestamp('due_at', { precision: 3 }).nullable()
    t.text('note').nullable()
    t.timestamp('created_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
    t.index(['class_id'])
    t.index(['student_id'])
  })
  // An assignment goes to exactly one class or one student.
  await knex.raw('ALTER TABLE assignments ADD CONSTRAINT assignments_one_target CHECK ((class_id IS NULL) <> (student_id IS NULL))')
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('assignments')
  await knex.schema.dropTable('drill_set_items')
  await knex.schema.dropTable('drill_sets')
}
