import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('drills', (t) => {
    // Our own grading of difficulty, 1 (first lessons) to 8 (advanced); null where the teacher set none.
    t.tinyint('level').unsigned().nullable()
    // Free tags as a JSON array of strings, searched together with the title.
    t.json('tags').nullable()
    // Archived drills leave the library's default view but keep their attempts and assignments.
    t.timestamp('archived_at', { precision: 3 }).nullable()
    // The drill this one was copied from (a duplicate, or a copy out of the shared library).
    t.bigInteger('copied_from_id').unsigned().nullable().references('drills.id').onDelete('SET NULL')
    t.index(['owner_id', 'archived_at', 'updated_at'])
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('drills', (t) => {
    t.dropForeign(['copied_from_id'])
    t.dropIndex(['owner_id', 'archived_at', 'updated_at'])
    t.dropColumns('level', 'tags', 'archived_at', 'copied_from_id')
  })
}
