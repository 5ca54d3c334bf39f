import type { Knex } from 'knex'

// When the student first opened the attempt after the comment was written; null while unread.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('comments', (t) => {
    t.timestamp('read_at', { precision: 3 }).nullable()
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('comments', (t) => {
    t.dropColumn('read_at')
  })
}
