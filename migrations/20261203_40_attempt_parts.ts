import type { Knex } from 'knex'

// An attempt may play part of a drill (some bars, one hand: a loop or hands separately); it is
// graded against those notes, so the part is kept beside it. Null: the whole drill.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('attempts', (t) => {
    t.smallint('part_from_bar').unsigned().nullable()
    t.smallint('part_to_bar').unsigned().nullable()
    t.enum('part_hand', ['right', 'left']).nullable()
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('attempts', (t) => {
    t.dropColumn('part_from_bar')
    t.dropColumn('part_to_bar')
    t.dropColumn('part_hand')
  })
}
