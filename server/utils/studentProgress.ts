// A student's progress and habits, read from the stored attempts only: plain aggregates in
// MariaDB, trend lines and habits with the engine's statistics. Nothing here is stored again.
import type { H3Event } from 'h3'
import type { Knex } from 'knex'
import type { z } from 'zod'
import type { User } from '#auth-utils'
import { fingerHabits, habitStatement, leastSquaresLine, unplannedShifts, type HabitResult, type ShiftResult } from '#shared/engine'
import type { DrillNote } from '#shared/types/drill'
import { addDays, dayAtOffset, offsetChanges, type OffsetChange } from '#shared/utils/localDays'
import { todayIn } from '#shared/utils/dueDate'
import { ATTEMPTS_PER_PAGE, RANGE_DAYS, StudentParams, type StudentAttemptsPage, type DrillProgress, type HabitsView, type PracticeDay, type ProgressFigure, type ProgressOverview, type ProgressPoint, type ProgressQuery, type ProgressRange, type TrendLine } from '#shared/types/progress'

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

/**
 * A request about one student (`/api/students/:id/…`): the signed-in caller, the query checked with
 * `querySchema`, and the student, 404 or 403 as `readableStudent`. The reply is marked private, as
 * it holds one student's record.
 */
export async function studentRequest<S extends z.ZodType>(event: H3Event, querySchema: S): Promise<{ user: User, db: Knex, student: StudentRef, query: z.infer<S> }> {
  const user = await requireRole(event)
  const { id } = validParams(event, StudentParams)
  const query = validQuery(event, querySchema)
  const db = useDb()
  const student = await readableStudent(db, user, id)
  setResponseHeader(event, 'cache-control', 'private, no-store')
  return { user, db, student, query }
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
    // The figures are MariaDB's generated columns over each stored grade (migration 84).
    scoped().orderBy('started_at').select('id', 'started_at', 'score', 'timing_sd_ms as sd_ms', 'velocity_sd',
      'positions_planned as planned', 'positions_played as played', 'played_bpm'),
    scoped().first(
      db.raw('COUNT(*) AS n'), db.raw('MAX(score) AS best'), db.raw('AVG(score) AS mean'), db.raw('MAX(played_bpm) AS best_bpm'),
      db.raw('MIN(started_at) AS first'), db.raw('MAX(started_at) AS last'),
    ),
    assignmentsOfStudent(db, student.id).clone()
      .join('drill_set_items as dsi', 'dsi.drill_set_id', 'a.drill_set_id')
      .where('dsi.drill_id', drillId)
      .orderBy([{ column: 'a.due_at', order: 'desc' }, { column: 'a.id', order: 'desc' }])
      .first('dsi.target_tempo_bpm', 'dsi.target_score'),
    db('attempts').where({ student_id: student.id, drill_id: drillId }).orderBy('started_at', 'desc').first('positions_planned as planned'),
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

/** Where a student's days begin and end: an IANA zone, or a fixed offset in minutes east of UTC. */
export type DayZone = string | number

/** How many days back a practice run is looked for. */
const STREAK_DAYS = 1000

/** Each zone's offsets over the span a request reads, worked out once a day per zone. */
const zoneHistories = new Map<string, OffsetChange[]>()

function zoneHistory(zone: string, now: number): OffsetChange[] {
  const today = Math.floor(now / DAY_MS) * DAY_MS
  const key = `${zone} ${today}`
  let history = zoneHistories.get(key)
  if (!history) {
    if (zoneHistories.size > 200) zoneHistories.clear()
    history = offsetChanges(zone, today - (STREAK_DAYS + 2) * DAY_MS, today + 2 * DAY_MS)
    zoneHistories.set(key, history)
  }
  return history
}

/**
 * A student's calendar day of `started_at`, in SQL: the instant moved by the offset in force then,
 * daylight-saving changes included, so MariaDB can group by the student's own days.
 */
function localDaySql(db: Knex, zone: DayZone, now: number): Knex.Raw {
  const changes = typeof zone === 'number' ? [{ fromMs: 0, offsetMinutes: zone }] : zoneHistory(zone, now)
  const later = changes.slice(1).reverse()
  const offset = later.length
    ? `CASE ${later.map(() => 'WHEN started_at >= ? THEN ?').join(' ')} ELSE ? END`
    : '?'
  const bindings = [...later.flatMap(c => [new Date(c.fromMs), c.offsetMinutes]), changes[0]!.offsetMinutes]
  return db.raw(`DATE_FORMAT(started_at + INTERVAL (${offset}) MINUTE, '%Y-%m-%d')`, bindings)
}

/** Every drill the student played with best and latest figures, the practice log and the run of days, in the student's days. */
export async function progressOverview(db: Knex, student: StudentRef, zone: DayZone, now = Date.now()): Promise<ProgressOverview> {
  const today = typeof zone === 'number' ? dayAtOffset(now, zone) : todayIn(zone, now)
  const streakFrom = now - (STREAK_DAYS + 1) * DAY_MS
  // A day before the log's first, so the whole of that day is read in any zone.
  const logFrom = now - (LOG_DAYS + 1) * DAY_MS
  const [records, days, practised] = await Promise.all([
    db('attempts as t').join('drills as d', 'd.id', 't.drill_id').where('t.student_id', student.id)
      .groupBy('t.drill_id', 'd.title').orderBy('last_at', 'desc')
      .select('t.drill_id', 'd.title', db.raw('COUNT(*) AS n'), db.raw('MAX(t.score) AS best'),
        db.raw('SUBSTRING_INDEX(GROUP_CONCAT(t.score ORDER BY t.started_at DESC, t.id DESC), \',\', 1) AS latest'),
        db.raw('MAX(t.played_bpm) AS best_bpm'),
        db.raw('SUBSTRING_INDEX(GROUP_CONCAT(COALESCE(t.played_bpm, \'\') ORDER BY t.started_at DESC, t.id DESC), \',\', 1) AS latest_bpm'),
        db.raw('MAX(t.started_at) AS last_at')),
    db('attempts').where('student_id', student.id).where('started_at', '>=', new Date(logFrom))
      .groupByRaw('1').select(
        db.raw('? AS day', [localDaySql(db, zone, now)]),
        db.raw('COUNT(*) AS n'),
        db.raw('SUM(duration_ms) / 60000 AS minutes'),
      ),
    db('attempts').where('student_id', student.id).where('started_at', '>=', new Date(streakFrom))
      .distinct(db.raw('? AS day', [localDaySql(db, zone, now)])).orderBy('day', 'desc').limit(STREAK_DAYS),
  ])
  const byDay = new Map<string, { n: number, minutes: number }>(days.map((d: Record<string, unknown>) => [String(d.day), { n: Number(d.n), minutes: Number(d.minutes) }]))
  const log: PracticeDay[] = []
  for (let k = LOG_DAYS - 1; k >= 0; k--) {
    const day = addDays(today, -k)
    const d = byDay.get(day)
    log.push({ day, minutes: d ? Math.round(d.minutes * 10) / 10 : 0, attempts: d?.n ?? 0 })
  }
  const done = new Set(practised.map((r: { day: string }) => String(r.day)))
  let streak = 0
  // Today without practice yet does not break the run: the day is not over.
  let cursor = done.has(today) ? today : addDays(today, -1)
  while (done.has(cursor)) {
    streak++
    cursor = addDays(cursor, -1)
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

/** The `habit_figures` column: the parts of a stored grade the habits read. */
interface HabitFigures {
  fingers: HabitResult['inferredFingers']
  deviations: HabitResult['timing']['deviationsMs']
  velocities: HabitResult['loudness']['velocities']
  at: ShiftResult['positionChanges']['at']
  plannedAt: ShiftResult['positionChanges']['plannedAt']
}

/** Per-finger habits and unplanned position changes over the student's recent attempts. */
export async function studentHabits(db: Knex, viewer: User, student: StudentRef, range: ProgressRange, now = Date.now()): Promise<HabitsView> {
  const from = since(range, now)
  // `habit_figures` is MariaDB's generated column of the arrays below, taken from each stored grade (migration 84).
  const q = db('attempts').where('student_id', student.id).orderBy([{ column: 'started_at', order: 'desc' }, { column: 'id', order: 'desc' }]).limit(HABIT_ATTEMPTS)
    .select('drill_id', 'drill_version', 'habit_figures')
  if (from) q.where('started_at', '>=', from)
  const rows: Record<string, unknown>[] = await q
  const results: (HabitResult & ShiftResult & { drillId: number, version: number })[] = rows.map((r) => {
    const f = parseJson<HabitFigures>(r.habit_figures)
    return {
      drillId: Number(r.drill_id),
      version: Number(r.drill_version),
      inferredFingers: f.fingers,
      timing: { deviationsMs: f.deviations },
      loudness: { velocities: f.velocities },
      positionChanges: { at: f.at, plannedAt: f.plannedAt },
    }
  })
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

/** One page of the student's attempts, newest first, each with its drill and how many comments it has. */
export async function studentAttempts(db: Knex, student: StudentRef, page: number): Promise<StudentAttemptsPage> {
  const [rows, count] = await Promise.all([
    db('attempts as a').join('drills as d', 'd.id', 'a.drill_id').where('a.student_id', student.id)
      .orderBy([{ column: 'a.started_at', order: 'desc' }, { column: 'a.id', order: 'desc' }])
      .limit(ATTEMPTS_PER_PAGE).offset((page - 1) * ATTEMPTS_PER_PAGE)
      .select('a.id', 'a.drill_id', 'd.title', 'a.started_at', 'a.score', 'a.tempo_bpm', 'a.played_bpm', 'a.input_device',
        'a.part_from_bar', 'a.part_to_bar', 'a.part_hand', db('comments as c').whereRaw('c.attempt_id = a.id').count('*').as('comments')),
    db('attempts').where('student_id', student.id).count({ n: '*' }).first(),
  ])
  return {
    student,
    attempts: rows.map((r: Record<string, unknown>) => ({
      id: String(r.id),
      drillId: Number(r.drill_id),
      drillTitle: String(r.title),
      startedAt: new Date(r.started_at as string).toISOString(),
      score: Number(r.score),
      tempoBpm: Number(r.tempo_bpm),
      playedBpm: num(r.played_bpm),
      inputDevice: String(r.input_device),
      part: r.part_from_bar == null ? null : { fromBar: Number(r.part_from_bar), toBar: Number(r.part_to_bar), hand: r.part_hand == null ? null : String(r.part_hand) },
      comments: Number(r.comments),
    })),
    page,
    perPage: ATTEMPTS_PER_PAGE,
    total: Number(count?.n ?? 0),
  }
}

/** What both progress routes answer: one drill's series with `drill`, else the overview. */
export async function studentProgress(event: H3Event, user: User, studentId: number, query: ProgressQuery): Promise<DrillProgress | ProgressOverview> {
  const db = useDb()
  const student = await readableStudent(db, user, studentId)
  setResponseHeader(event, 'cache-control', 'private, no-store')
  if (query.drill) return drillProgress(db, user, student, query.drill, query.range)
  // The student's own zone, kept from their latest sign-in; else, to the student, their browser's; else the offset the page sent.
  const stored = await db('users').where('id', student.id).first('time_zone')
  const zone = stored?.time_zone ?? (user.id === student.id ? browserTimeZone(event) : null) ?? query.tz
  return progressOverview(db, student, zone)
}
