// The guardian's weekly summary: for each student with a guardian address (who has not stopped it),
// the week's practice minutes per day, attempts, best scores against the targets of current
// assignments and the teacher's new comments, queued once per student and week. The week and its days
// are the student's own: Monday 00:00 to Monday 00:00 in `users.time_zone` (UTC when unknown).
// Explicit imports: `npm run mail:weekly` runs this outside Nitro.
import type { Knex } from 'knex'
import { startOfDayIn, todayIn } from '../../shared/utils/dueDate'
import { addDays } from '../../shared/utils/localDays'
import { assignmentsOfStudent } from './access'
import { queueMail } from './mail'
import { DAY_MS, issueToken } from './tokens'
import type { WeeklySummaryMail } from '../mail/templates/weekly-summary'

/** How long the unsubscribe link in a summary keeps working. */
const UNSUBSCRIBE_TTL_MS = 90 * DAY_MS

/** The Monday (YYYY-MM-DD) of the week holding the calendar day `day` (YYYY-MM-DD). */
export function mondayOf(day: string): string {
  const sinceMonday = (new Date(`${day}T12:00:00Z`).getUTCDay() + 6) % 7
  return addDays(day, -sinceMonday)
}

/** The Monday (YYYY-MM-DD) of the last week that has ended in `zone` by `now`, never the one still running. */
export function lastCompleteWeek(zone: string, now: Date = new Date()): string {
  return addDays(mondayOf(todayIn(zone, now.getTime())), -7)
}

const dayIn = (at: Date | string, zone: string): string => todayIn(zone, new Date(at).getTime())

interface EventLike { timeMs: number }

/** Minutes an attempt took: from its first to its last recorded event. */
export function attemptMinutes(events: EventLike[]): number {
  if (events.length < 2) return 0
  let first = Infinity
  let last = -Infinity
  for (const e of events) {
    if (e.timeMs < first) first = e.timeMs
    if (e.timeMs > last) last = e.timeMs
  }
  return (last - first) / 60_000
}

function parseEvents(value: unknown): EventLike[] {
  const parsed = typeof value === 'string' ? JSON.parse(value) : value
  return Array.isArray(parsed) ? parsed as EventLike[] : []
}

/** What one student's summary says about the week from Monday `week` (YYYY-MM-DD) in the student's `zone`. */
export async function summariseWeek(db: Knex, student: { id: number, name: string, zone: string }, week: string): Promise<Omit<WeeklySummaryMail, 'unsubscribeLink' | 'appLink'>> {
  // Bounds from the zone's own midnights: a week with a daylight-saving change lasts 167 or 169 hours.
  const weekStart = startOfDayIn(week, student.zone)
  const weekEnd = startOfDayIn(addDays(week, 7), student.zone)
  const attempts = await db('attempts').where('student_id', student.id)
    .where('started_at', '>=', weekStart).where('started_at', '<', weekEnd)
    .select('started_at', 'events', 'drill_id', 'score')
  const days = Array.from({ length: 7 }, (_, i) => ({ date: addDays(week, i), minutes: 0, attempts: 0 }))
  for (const a of attempts) {
    const day = days.find(d => d.date === dayIn(a.started_at, student.zone))!
    day.attempts++
    day.minutes += attemptMinutes(parseEvents(a.events))
  }

  // Current assignments: not yet due when the week began (or with no due date), and given before it ended.
  const items: { due_at: Date | null, due_on: string | null, setTitle: string, drillId: number, drillTitle: string, target_score: number | null }[] = await assignmentsOfStudent(db, student.id).clone()
    .where(q => q.whereNull('a.due_at').orWhere('a.due_at', '>=', weekStart))
    .where('a.created_at', '<', weekEnd)
    .join('drill_sets as ds', 'ds.id', 'a.drill_set_id')
    .join('drill_set_items as dsi', 'dsi.drill_set_id', 'a.drill_set_id')
    .join('drills as d', 'd.id', 'dsi.drill_id')
    .orderBy([{ column: 'a.due_at' }, { column: 'a.id' }, { column: 'dsi.position' }])
    .select('a.due_at', db.raw('DATE_FORMAT(a.due_on, \'%Y-%m-%d\') AS due_on'), 'ds.title as setTitle', 'd.id as drillId', 'd.title as drillTitle', 'dsi.target_score')
  const best = new Map<number, number>()
  for (const a of attempts) best.set(Number(a.drill_id), Math.max(best.get(Number(a.drill_id)) ?? 0, Number(a.score)))
  const targets = items.map(i => ({
    setTitle: i.setTitle,
    drillTitle: i.drillTitle,
    // The day the teacher chose; an assignment from before due days were kept reads its deadline in the student's zone.
    dueOn: i.due_on ?? (i.due_at ? dayIn(i.due_at, student.zone) : null),
    targetScore: i.target_score == null ? null : Number(i.target_score),
    bestScore: best.get(Number(i.drillId)) ?? null,
  }))

  const comments = await db('comments as c')
    .join('attempts as t', 't.id', 'c.attempt_id')
    .join('drills as d', 'd.id', 't.drill_id')
    .join('users as u', 'u.id', 'c.teacher_id')
    .where('t.student_id', student.id)
    .where('c.created_at', '>=', weekStart).where('c.created_at', '<', weekEnd)
    .orderBy('c.created_at')
    .select('u.name as teacherName', 'd.title as drillTitle', 'c.body', 'c.created_at')

  return {
    studentName: student.name,
    weekStart: week,
    days,
    targets,
    comments: comments.map(c => ({ teacherName: c.teacherName, drillTitle: c.drillTitle, body: c.body, date: dayIn(c.created_at, student.zone) })),
  }
}

export interface WeeklyRun {
  weekStart: string
  queued: number
  alreadyQueued: number
}

/**
 * Queues the summary of the week from Monday `week` (YYYY-MM-DD; default: for each student, the last
 * week that has ended in their own zone) for every student whose guardian has not stopped it. Each
 * student's mail and its row in weekly_summaries are written in one transaction, and that row's key
 * (student, week) lets a week go out only once, even when two instances run this at the same moment.
 */
export async function queueWeeklySummaries(db: Knex, options: { appUrl: string, week?: string, now?: Date }): Promise<WeeklyRun> {
  const week = options.week ? mondayOf(options.week) : undefined
  const base = options.appUrl.replace(/\/+$/, '')
  const students = await db('users').where('role', 'student').whereNotNull('guardian_email').whereNull('guardian_summary_stopped_at')
    .select('id', 'name', 'guardian_email', 'time_zone')
  const run: WeeklyRun = { weekStart: week ?? lastCompleteWeek('UTC', options.now), queued: 0, alreadyQueued: 0 }
  for (const s of students) {
    const zone: string = s.time_zone ?? 'UTC'
    const studentWeek = week ?? lastCompleteWeek(zone, options.now)
    if (await db('weekly_summaries').where({ student_id: s.id, week_start: studentWeek }).first('student_id')) {
      run.alreadyQueued++
      continue
    }
    const summary = await summariseWeek(db, { id: Number(s.id), name: s.name, zone }, studentWeek)
    try {
      await db.transaction(async (trx) => {
        await trx('weekly_summaries').insert({ student_id: s.id, week_start: studentWeek })
        const token = await issueToken(trx, { kind: 'guardian-unsubscribe', userId: Number(s.id), subject: s.guardian_email, ttlMs: UNSUBSCRIBE_TTL_MS })
        const outboxId = await queueMail(trx, {
          to: s.guardian_email,
          template: 'weekly-summary',
          data: { ...summary, appLink: base, unsubscribeLink: `${base}/unsubscribe?token=${token}` },
        })
        await trx('weekly_summaries').where({ student_id: s.id, week_start: studentWeek }).update({ outbox_id: outboxId })
      })
      run.queued++
    }
    catch (error) {
      // Another instance queued this student's week first.
      if ((error as { code?: string }).code !== 'ER_DUP_ENTRY') throw error
      run.alreadyQueued++
    }
  }
  return run
}
