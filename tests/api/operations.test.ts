// The operator's commands against the test database: a backup restored elsewhere holds the same data,
// and a regrade brings attempts graded by an older engine up to the current one.
import { execFile } from 'node:child_process'
import { createHash } from 'node:crypto'
import { existsSync, rmSync } from 'node:fs'
import { promisify } from 'node:util'
import { afterAll, describe, expect, it } from 'vitest'
import { ENGINE_VERSION, gradeAttempt } from '../../shared/engine'
import { regradeAttempts } from '../../scripts/lib/regrade'
import { attemptBody, play, scaleDrill } from '../support/attempts'
import { Client, closeTestDb, testDb } from '../support/server'

const run = promisify(execFile)
const SCRATCH = `${process.env.NUXT_DB_DATABASE ?? 'evenhand_test'}_scratch_restore`

afterAll(async () => {
  await testDb().raw(`DROP DATABASE IF EXISTS \`${SCRATCH}\``)
  await closeTestDb()
})

async function tableCounts(database: string): Promise<Record<string, number>> {
  const db = testDb()
  const [tables] = await db.raw('SELECT table_name AS name FROM information_schema.tables WHERE table_schema = ? AND table_type = ? ORDER BY table_name', [database, 'BASE TABLE'])
  const counts: Record<string, number> = {}
  for (const { name } of tables as { name: string }[]) {
    const [[row]] = await db.raw(`SELECT COUNT(*) AS n FROM \`${database}\`.\`${name}\``)
    counts[name] = Number(row.n)
  }
  return counts
}

/** An ordered hash over what an attempt is: its id, score, raw events and grade. */
async function attemptsDigest(database: string): Promise<string> {
  const rows = await testDb().select('id', 'score', 'events', 'result', 'engine_version').from(`${database}.attempts`).orderBy('id')
  return createHash('sha256').update(JSON.stringify(rows)).digest('hex')
}

async function storeAttempt(): Promise<string> {
  const student = await new Client().signIn('samir@evenhand.test')
  const drill = await scaleDrill(student)
  const body = attemptBody(drill, { events: play(drill.drill.notes, drill.drill.tempoBpm * 0.8) })
  const res = await student.post('/api/attempts', body)
  expect(res.status).toBe(201)
  return body.id as string
}

describe('npm run db:backup and db:restore', () => {
  it('restores a backup into another database with every row of every table', async () => {
    await storeAttempt()
    const source = process.env.NUXT_DB_DATABASE!
    const { stdout } = await run('bash', ['scripts/db-backup.sh'], { env: process.env })
    const file = stdout.trim().split('\n').pop()!
    expect(file).toMatch(/\.sql\.gz$/)
    expect(existsSync(file)).toBe(true)
    try {
      await run('bash', ['scripts/db-restore.sh', file, SCRATCH], { env: process.env })
      const before = await tableCounts(source)
      expect(before.attempts).toBeGreaterThan(0)
      expect(Object.keys(before)).toContain('users')
      expect(await tableCounts(SCRATCH)).toEqual(before)
      expect(await attemptsDigest(SCRATCH)).toBe(await attemptsDigest(source))
    }
    finally {
      rmSync(file, { force: true })
      await testDb().raw(`DROP DATABASE IF EXISTS \`${SCRATCH}\``)
    }
  })

  it('refuses a missing file without touching any database', async () => {
    await expect(run('bash', ['scripts/db-restore.sh', '/nonexistent/backup.sql.gz', SCRATCH], { env: process.env }))
      .rejects.toMatchObject({ stderr: expect.stringContaining('no such backup file') })
  })
})

describe('npm run regrade', () => {
  it('regrades an attempt stored by an older engine from its events and keeps the old version on record', async () => {
    const id = await storeAttempt()
    const db = testDb()
    // What an older engine might have stored: another score and result.
    await db('attempts').where({ id }).update({ engine_version: '0.0.1-old', score: 3, result: JSON.stringify({ score: 3 }) })

    const { regraded, engineVersion } = await regradeAttempts(db, 2)
    expect(engineVersion).toBe(ENGINE_VERSION)
    expect(regraded).toBeGreaterThanOrEqual(1)

    const row = await db('attempts as a').join('drill_versions as v', function () {
      this.on('v.drill_id', 'a.drill_id').andOn('v.version', 'a.drill_version')
    }).where('a.id', id).first('a.*', 'v.hand', 'v.tempo_bpm as drill_bpm', 'v.notes')
    const parse = (v: unknown) => typeof v === 'string' ? JSON.parse(v) : v
    const stored = parse(row.result)
    const expected = gradeAttempt({ hand: row.hand, tempoBpm: row.drill_bpm, notes: parse(row.notes) }, parse(row.events), { targetBpm: stored.tempo.targetBpm })
    expect(stored).toEqual(JSON.parse(JSON.stringify(expected)))
    expect(row.score).toBe(Math.round(expected.score))
    expect(row.score).not.toBe(3)
    expect(row.engine_version).toBe(ENGINE_VERSION)
    expect(row.regraded_from_version).toBe('0.0.1-old')

    // A second run finds nothing left to do.
    expect((await regradeAttempts(db)).regraded).toBe(0)
  })
})
