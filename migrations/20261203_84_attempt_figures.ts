import type { Knex } from 'knex'

// The figures progress pages aggregate, kept by MariaDB itself beside the grade they come from
// (STORED generated columns: a regrade that rewrites `result` rewrites them, so they cannot drift),
// so a student's overview and charts read small columns instead of every attempt's JSON.
// `duration_ms` is an attempt's length: from its first event (or time zero, if a note came in the
// count-in) to its last; `habit_figures` gathers the per-note arrays the habits read, so they parse
// one small document per attempt instead of five paths of a large one.
const FIGURES: [name: string, type: string, expression: string][] = [
  ['played_bpm', 'DOUBLE', 'JSON_VALUE(result, \'$.tempo.playedBpm\')'],
  ['timing_sd_ms', 'DOUBLE', 'JSON_VALUE(result, \'$.timing.sdMs\')'],
  ['velocity_sd', 'DOUBLE', 'JSON_VALUE(result, \'$.loudness.sd\')'],
  ['positions_planned', 'INT UNSIGNED', 'JSON_VALUE(result, \'$.positionChanges.planned\')'],
  ['positions_played', 'INT UNSIGNED', 'JSON_VALUE(result, \'$.positionChanges.played\')'],
  ['habit_figures', 'LONGTEXT', `JSON_OBJECT(${[['fingers', 'inferredFingers'], ['deviations', 'timing.deviationsMs'], ['velocities', 'loudness.velocities'], ['at', 'positionChanges.at'], ['plannedAt', 'positionChanges.plannedAt']]
    .map(([key, path]) => `'${key}', JSON_EXTRACT(result, '$.${path}')`).join(', ')})`],
  ['duration_ms', 'DOUBLE', 'GREATEST(0, COALESCE(JSON_VALUE(events, \'$[last].timeMs\'), 0) - LEAST(0, COALESCE(JSON_VALUE(events, \'$[0].timeMs\'), 0)))'],
]

export async function up(knex: Knex): Promise<void> {
  await knex.raw(`ALTER TABLE attempts ${FIGURES.map(([name, type, expression]) => `ADD COLUMN ${name} ${type} AS (${expression}) STORED`).join(', ')}`)
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('attempts', (t) => {
    for (const [name] of FIGURES) t.dropColumn(name)
  })
}
