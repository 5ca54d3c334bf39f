import type { Knex } from 'knex'

// Class progress aggregates count, best and latest scores per student and drill inside MariaDB: with `score`
// in the index those come from the index alone, never from the rows with their events. Attempt lists page
// newest first by (started_at, id), per student (across drills) and across a teacher's students.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('attempts', (t) => {
    t.index(['student_id', 'drill_id', 'started_at', 'score'], 'attempts_student_drill_started_score_index')
    t.index(['student_id', 'started_at'], 'attempts_student_started_index')
    t.index(['started_at'], 'attempts_started_index')
  })
  // The new index starts with student_id, so the foreign key keeps an index when the old one goes.
  await knex.schema.alterTable('attempts', (t) => {
    t.dropIndex(['student_id', 'drill_id', 'started_at'])
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('attempts', (t) => {
    t.index(['student_id', 'drill_id', 'started_at'])
  })
  await knex.schema.alterTable('attempts', (t) => {
    t.dropIndex(['student_id', 'drill_id', 'started_at', 'score'], 'attempts_student_drill_started_score_index')
    t.dropIndex(['student_id', 'started_at'], 'attempts_student_started_index')
    t.dropIndex(['started_at'], 'attempts_started_index')
  })
}
