import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('drills', (t) => {
    t.bigIncrements('id')
    t.bigInteger('owner_id').unsigned().notNullable().references('users.id').onDelete('CASCADE')
    t.string('title', 160).notNullable()
    t.text('description').nullable()
    t.enum('kind', ['scale', 'arpeggio', 'five-finger', 'sequence', 'passage', 'other']).notNullable().defaultTo('other')
    t.enum('hand', ['right', 'left', 'both']).notNullable()
    t.string('key_signature', 16).nullable()
    t.string('meter', 8).notNullable().defaultTo('4/4')
    t.smallint('tempo_bpm').unsigned().notNullable()
    // The current version's notes: [{ pitch, beat, length, hand?, finger? }]
    t.json('notes').notNullable()
    t.enum('source', ['typed', 'recorded', 'midi-file', 'musicxml']).notNullable().defaultTo('typed')
    t.integer('version').unsigned().notNullable().defaultTo(1)
    // Public drills are the studio-wide free practice library that every signed-in user may play.
    t.boolean('is_public').notNullable().defaultTo(false)
    t.timestamp('created_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
    t.timestamp('updated_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
    t.index(['owner_id'])
    t.index(['is_public'])
  })
  // Every version a drill has had, so an attempt is always shown against the notes it was played on.
  await knex.schema.createTable('drill_versions', (t) => {
    t.bigInteger('drill_id').unsigned().notNullable().references('drills.id').onDelete('CASCADE')
    t.integer('version').unsigned().notNullable()
    t.enum('hand', ['right', 'left', 'both']).notNullable()
    t.smallint('tempo_bpm').unsigned().notNullable()
    t.json('notes').notNullable()
    t.timestamp('created_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
    t.primary(['drill_id', 'version'])
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('drill_versions')
  await knex.schema.dropTable('drills')
}
