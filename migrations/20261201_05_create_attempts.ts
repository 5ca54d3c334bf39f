import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('attempts', (t) => {
    // Chosen by the browser (a UUID) so that a re-sent attempt is stored once.
    t.specificType('id', 'CHAR(36)').primary()
    t.bigInteger('student_id').unsigned().notNullable().references('users.id').onDelete('CASCADE')
    t.bigInteger('drill_id').unsigned().notNullable().references('drills.id').onDelete('CASCADE')
    t.integer('drill_version').unsigned().notNullable()
    t.bigInteger('assignment_id').unsigned().nullable().references('assignments.id').onDelete('SET NULL')
    t.timestamp('started_at', { precision: 3 }).notNullable()
    t.decimal('tempo_bpm', 5, 1).notNullable()
    t.enum('input_device', ['midi', 'screen', 'computer-keys']).notNullable()
    t.string('device_name', 200).nullable()
    // Raw events exactly as played: [{ note, on, velocity, timeMs }]; the grade can always be recomputed.
    t.json('events').notNullable()
    t.json('pedal').nullable()
    t.tinyint('score').unsigned().notNullable()
    t.json('result').notNullable()
    t.string('engine_version', 20).notNullable()
    t.timestamp('created_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
    t.index(['student_id', 'drill_id', 'started_at'])
    t.index(['drill_id'])
    t.index(['assignment_id'])
  })
  await knex.schema.createTable('comments', (t) => {
    t.bigIncrements('id')
    t.specificType('attempt_id', 'CHAR(36)').notNullable().references('attempts.id').onDelete('CASCADE')
    t.bigInteger('teacher_id').unsigned().notNullable().references('users.id').onDelete('CASCADE')
    t.text('body').notNullable()
    t.timestamp('created_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
    t.index(['attempt_id'])
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('comments')
  await knex.schema.dropTable('attempts')
}
