// A student's progress and habits, read from the stored attempts only: plain aggregates in
// MariaDB, trend lines and habits with the engine's statistics. Nothing here is stored again.
import type { H3Event } from 'h3'
import type { Knex } from 'knex'
import type { User } from '#auth-utils'
import { fingerHabits, habitStatement, leastSquaresLine, unplannedShifts, type HabitResult, type ShiftResult } from '#shared/engine'
import type { DrillNote } from '#shared/types/drill'
import { RANGE_DAYS, type DrillProgress, type HabitsView, type PracticeDay, type ProgressFigure, type ProgressOverview, type ProgressPoint, type ProgressQuery, type ProgressRange, type TrendLine } from '#shared/types/progress'

const DAY_MS = 86_400_000
const LOG_DAYS = 56
/** The habits read at most this many of the latest attempts, so a long history stays quick. */
const HABIT_ATTEMPTS = 300

export interface StudentRef { id: number, name: string }

/** The student `id` when `user` may read their attempts: 404 for no such student, 403 for anyone else's. */
export async function readableStudent(db: Knex, user: User, id: number): Promise<StudentRef> {
  const row = await db('users').where({ id, role: 'student' }).first('id', 'name')
  if (!row) throw createError({ statusCode: 404, statusMessage: 'Not found', message: 'Student not found' })
  if (!(await mayReadStudent(db, user, id))) {
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: 'This student is not one of yours' })
  }
  return { id: Number(row.id), name: String(row.name) }
}

function since(range: ProgressRange, now: number): Date | null {
  const days = RANGE_DAYS[range]
  return days === null ? null : new Date(now - days * DAY_MS)
}

const num = (v: unknown): number | null => (v === null || v === undefined || v === '' ? null : Number(v))

function trend(points: ProgressPoint[], figure: ProgressFigure): TrendLine | undefined {
  const xs: number[] = []
  const ys: number[] = []
  for (const p of points) {
    const y = p[figure]
    if (y === null) continue
    xs.push(Date.parse(p.startedAt) / DAY_MS)
    ys.push(y)
  }
  const line = leastSquaresLine(xs, ys)
  if (!line || xs.length < 2) return undefined
  const at = (x: number): { at: string, value: number } => ({ at: new Date(x * DAY_MS).toISOString(), value: line.intercept + line.slope * x })
  return { from: at(xs[0]!), to: at(xs.at(-1)!), perWeek: line.slope * 7 }
}

/** One drill's attempts by one student as points over time, with trend lines and the target. */
export async function drillProgress(db: Knex, user: User, student: StudentRef, drillId: number, range: ProgressRange, now = Date.now()): Promise<DrillProgress> {
  const drill = await db('drills').where('id', drillId).first('id', 'title', 'tempo_bpm')
  const from = since(range, now)
  const scoped = (): Knex.QueryBuilder => {
    const q = db('attempts').where({ student_id: student.id, drill_id: drillId })
    if (from) q.where('started_at', '>=', from)
    return q
  }
  // A drill the user cannot open and the student never played is as good as missing.
  const visible = drill && (await db.from(visibleDrillIds(db, user).as('v')).where('v.id', drillId).first()
    || await db('attempts').where({ student_id: student.id, drill_id: drillId }).first('id'))
  if (!visible) throw createError({ statusCode: 404, statusMessage: 'Not found', message: 'Drill not found' })

  const [rows, summary, target, plan] = await Promise.all([
    scoped().orderBy('started_at').select(
      'id', 'started_at', 'score',
      db.raw('JSON_VALUE(result, \'$.timing.sdMs\') AS sd_ms'),
      db.raw('JSON_VALUE(result, \'$.loudness.sd\') AS velocity_sd'),
      db.raw('JSON_VALUE(result, \'$.positionChanges.planned\') AS planned'),
      db.raw('JSON_VALUE(result, \'$.positionChanges.played\') AS played'),
      db.raw('JSON_VALUE(result, \'$.tempo.playedBpm\') AS played_bpm'),
    ),
    scoped().first(
      db.raw('COUNT(*) AS n'), db.raw('MAX(score) AS best'), db.raw('AVG(score) AS mean'),
      db.raw('MAX(CAST(JSON_VALUE(result, \'$.tempo.playedBpm\') AS DOUBLE)) AS best_bpm'),
      db.raw('MIN(started_at) AS first'), db.raw('MAX(started_at) AS last'),
    ),
    assignmentsOfStudent(db, student.id).clone()
      .join('drill_set_items as dsi', 'dsi.drill_set_id', 'a.drill_set_id')
      .where('dsi.drill_id', drillId)
      .orderBy([{ column: 'a.due_at', order: 'desc' }, { column: 'a.id', order: 'desc' }])
      .first('dsi.target_tempo_bpm', 'dsi.target_score'),
    db('attempts').where({ student_id: student.id, drill_id: drillId }).orderBy('started_at', 'desc')
      .first(db.raw('JSON_VALUE(result, \'$.positionChanges.planned\') AS planned')),
  ])
  const points: ProgressPoint[] = rows.map((r: Record<string, unknown>) => {
    const sd = num(r.sd_ms)
    const bpm = num(r.played_bpm)
    return {
      attemptId: String(r.id),
      startedAt: new Date(r.started_at as string).toISOString(),
      score: Number(r.score),
      timingSdMs: sd,
      // A beat lasts 60,000 / bpm ms, so sd as a share of it is sd × bpm / 600 per cent.
      timingBeatPercent: sd === null || bpm === null ? null : (sd * bpm) / 600,
      velocitySd: num(r.velocity_sd),
      positionsPlanned: Number(r.planned),
      positionsPlayed: Number(r.played),
      playedBpm: bpm,
    }
  })
  const trends: DrillProgress['trends'] = {}
  for (const figure of ['score', 'timingSdMs', 'timingBeatPercent', 'velocitySd', 'positionsPlayed', 'playedBpm'] as const) {
    const line = trend(points, figure)
    if (line) trends[figure] = line
  }
  return {
    student,
    drill: { id: drillId, title: String(drill.title), tempoBpm: Number(drill.tempo_bpm), positionsPlanned: num(plan?.planned) },
    range,
    target: { score: num(target?.target_score), tempoBpm: num(target?.target_tempo_bpm) ?? Number(drill.tempo_bpm) },
    summary: {
      attempts: Number(summary.n),
      best: num(summary.best),
      mean: num(summary.mean),
      bestBpm: num(summary.best_bpm),
      first: summary.first ? new Date(summary.first).toISOString() : null,
      last: summary.last ? new Date(summary.last).toISOString() : null,
    },
    points,
    trends,
  }
}

function dayKey(ms: number): string {
  return new Date(ms).toISOString().slice(0, 10)
}

/** Every drill the student played with best and latest figures, the practice log and the run of days. */
export async function progressOverview(db: Knex, student: StudentRef, tzMinutes: number, now = Date.now()): Promise<ProgressOverview> {
  const localNow = now + tzMinutes * 60_000
  const firstDay = dayKey(localNow - (LOG_DAYS - 1) * DAY_MS)
  const [records, days, practised] = await Promise.all([
    db('attempts as t').join('drills as d', 'd.id', 't.drill_id').where('t.student_id', student.id)
      .groupBy('t.drill_id', 'd.title').orderBy('last_at', 'desc')
      .select('t.drill_id', 'd.title', db.raw('COUNT(*) AS n'), db.raw('MAX(t.score) AS best'),
        db.raw('SUBSTRING_INDEX(GROUP_CONCAT(t.score ORDER BY t.started_at DESC), \',\', 1) AS latest'),
        db.raw('MAX(CAST(JSON_VALUE(t.result, \'$.tempo.playedBpm\') AS DOUBLE)) AS best_bpm'),
        db.raw('SUBSTRING_INDEX(GROUP_CONCAT(COALESCE(JSON_VALUE(t.result, \'$.tempo.playedBpm\'), \'\') ORDER BY t.started_at DESC), \',\', 1) AS latest_bpm'),
        db.raw('MAX(t.started_at) AS last_at')),
    // An attempt lasts from its first event (or time zero, if a note came in the count-in) to its last.
    db('attempts').where('student_id', student.id).where('started_at', '>=', new Date(now - (LOG_DAYS + 1) * DAY_MS))
      .groupByRaw('1').select(
        db.raw('DATE_FORMAT(DATE(started_at + INTERVAL ? MINUTE), \'%Y-%m-%d\') AS day', [tzMinutes]),
        db.raw('COUNT(*) AS n'),
        db.raw('SUM(GREATEST(0, COALESCE(JSON_VALUE(events, \'$[last].timeMs\'), 0) - LEAST(0, COALESCE(JSON_VALUE(events, \'$[0].timeMs\'), 0)))) / 60000 AS minutes'),
      ),
    db('attempts').where('student_id', student.id)
      .distinct(db.raw('DATE_FORMAT(DATE(started_at + INTERVAL ? MINUTE), \'%Y-%m-%d\') AS day', [tzMinutes])).orderBy('day', 'desc').limit(1000),
  ])
  const byDay = new Map<string, { n: number, minutes: number }>(days.map((d: Record<string, unknown>) => [String(d.day), { n: Number(d.n), minutes: Number(d.minutes) }]))
  const log: PracticeDay[] = []
  for (let k = LOG_DAYS - 1; k >= 0; k--) {
    const day = dayKey(localNow - k * DAY_MS)
    if (day < firstDay) continue
    const d = byDay.get(day)
    log.push({ day, minutes: d ? Math.round(d.minutes * 10) / 10 : 0, attempts: d?.n ?? 0 })
  }
  const done = new Set(practised.map((r: { day: string }) => String(r.day)))
  let streak = 0
  // Today without practice yet does not break the run: the day is not over.
  let cursor = done.has(dayKey(localNow)) ? localNow : localNow - DAY_MS
  while (done.has(dayKey(cursor))) {
    streak++
    cursor -= DAY_MS
  }
  return {
    student,
    drills: records.map((r: Record<string, unknown>) => ({
      drillId: Number(r.drill_id),
      title: String(r.title),
      attempts: Number(r.n),
      best: Number(r.best),
      latest: Number(r.latest),
      bestBpm: num(r.best_bpm),
      latestBpm: num(r.latest_bpm),
      lastAt: new Date(r.last_at as string).toISOString(),
    })),
    log,
    streak,
  }
}

/** Per-finger habits and unplanned position changes over the student's recent attempts. */
export async function studentHabits(db: Knex, viewer: User, student: StudentRef, range: ProgressRange, now = Date.now()): Promise<HabitsView> {
  const from = since(range, now)
  const q = db('attempts').where('student_id', student.id).orderBy('started_at', 'desc').limit(HABIT_ATTEMPTS)
    .select('drill_id', 'drill_version',
      db.raw('JSON_EXTRACT(result, \'$.inferredFingers\') AS fingers'),
      db.raw('JSON_EXTRACT(result, \'$.timing.deviationsMs\') AS deviations'),
      db.raw('JSON_EXTRACT(result, \'$.loudness.velocities\') AS velocities'),
      db.raw('JSON_EXTRACT(result, \'$.positionChanges.at\') AS shift_at'),
      db.raw('JSON_EXTRACT(result, \'$.positionChanges.plannedAt\') AS shift_planned'))
  if (from) q.where('started_at', '>=', from)
  const rows: Record<string, unknown>[] = await q
  const results: (HabitResult & ShiftResult & { drillId: number, version: number })[] = rows.map(r => ({
    drillId: Number(r.drill_id),
    version: Number(r.drill_version),
    inferredFingers: parseJson(r.fingers),
    timing: { deviationsMs: parseJson(r.deviations) },
    loudness: { velocities: parseJson(r.velocities) },
    positionChanges: { at: parseJson(r.shift_at), plannedAt: parseJson(r.shift_planned) },
  }))
  const who = viewer.id === student.id ? 'your' : `${student.name.split(' ')[0]}'s`
  const shifts = unplannedShifts(results)
  // The pitch at a place comes from the latest version of the drill the student played there.
  const versions = new Map<number, number>()
  for (const r of results) versions.set(r.drillId, Math.max(versions.get(r.drillId) ?? 0, r.version))
  const drills: Record<string, unknown>[] = shifts.length
    ? await db('drills as d').join('drill_versions as v', 'v.drill_id', 'd.id')
        .whereIn(['v.drill_id', 'v.version'], shifts.map(s => [s.drillId, versions.get(s.drillId)!]))
        .select('d.id', 'd.title', 'v.notes')
    : []
  const drillById = new Map(drills.map(d => [Number(d.id), { title: String(d.title), notes: parseJson<DrillNote[]>(d.notes) }]))
  return {
    student,
    range,
    attempts: results.length,
    fingers: fingerHabits(results).map(h => ({ ...h, statement: habitStatement(h, who) })),
    shifts: shifts.map(s => ({
      ...s,
      drillTitle: drillById.get(s.drillId)?.title ?? '',
      pitch: drillById.get(s.drillId)?.notes[s.noteIndex]?.pitch ?? null,
    })),
  }
}

/** What both progress routes answer: one drill's series with `drill`, else the overview. */
export async function studentProgress(event: H3Event, user: User, studentId: number, query: ProgressQuery): Promise<DrillProgress | ProgressOverview> {
  const db = useDb()
  const student = await readableStudent(db, user, studentId)
  setResponseHeader(event, 'cache-control', 'private, no-store')
  return query.drill ? drillProgress(db, user, student, query.drill, query.range) : progressOverview(db, student, query.tz)
}
