// Recomputes stored attempts with the current engine, from their raw events and the drill version they were played on.
// Shared by `npm run regrade` and its test; relative imports only, so tsx and vitest load it without Nuxt's aliases.
import type { Knex } from 'knex'
import { ENGINE_VERSION, gradeAttempt, type GradeResult } from '../../shared/engine'
import type { DrillNote } from '../../shared/types/drill'
import type { PlayedEvent } from '../../shared/types/attempt'

export interface RegradeSummary {
  regraded: number
  engineVersion: string
}

// mysql2 hands MariaDB's JSON columns (LONGTEXT underneath) back as strings.
function json<T>(value: unknown): T {
  return (typeof value === 'string' ? JSON.parse(value) : value) as T
}

/** Regrades, batch by batch, every attempt whose stored engine version differs from the current one. */
export async function regradeAttempts(db: Knex, batchSize = 200): Promise<RegradeSummary> {
  let regraded = 0
  let after = ''
  for (;;) {
    const rows = await db('attempts as a')
      .join('drill_versions as v', function () {
        this.on('v.drill_id', 'a.drill_id').andOn('v.version', 'a.drill_version')
      })
      .where('a.engine_version', '<>', ENGINE_VERSION)
      .where('a.id', '>', after)
      .orderBy('a.id')
      .limit(batchSize)
      .select('a.id', 'a.events', 'a.result', 'a.engine_version', 'v.hand', 'v.tempo_bpm', 'v.notes')
    if (!rows.length) break
    await db.transaction(async (trx) => {
      for (const row of rows) {
        const before = json<Partial<GradeResult>>(row.result)
        // The target the student played against (an assignment's tempo may since have changed).
        const targetBpm = before.tempo?.targetBpm ?? Number(row.tempo_bpm)
        const result = gradeAttempt(
          { hand: row.hand, tempoBpm: Number(row.tempo_bpm), notes: json<DrillNote[]>(row.notes) },
          json<PlayedEvent[]>(row.events),
          { targetBpm },
        )
        await trx('attempts').where({ id: row.id }).update({
          score: Math.round(result.score),
          result: JSON.stringify(result),
          engine_version: ENGINE_VERSION,
          regraded_from_version: row.engine_version,
          regraded_at: new Date(),
        })
      }
    })
    regraded += rows.length
    after = rows[rows.length - 1].id
  }
  return { regraded, engineVersion: ENGINE_VERSION }
}
