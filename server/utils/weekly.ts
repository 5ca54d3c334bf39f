// The guardian's weekly summary: for each student with a guardian address (who has not stopped it),
// the week's practice minutes per day, attempts, best scores against the targets of current
// assignments and the teacher's new comments, queued once per student and week.
// Explicit imports: `npm run mail:weekly` runs this outside Nitro.
import type { Knex } from 'knex'
import { assignmentsOfStudent } from './access'
import { queueMail } from './mail'
import { DAY_MS, issueToken } from './tokens'
import type { WeeklySummaryMail } from '../mail/templates/weekly-summary'

/** How long the unsubscribe link in a summary keeps working. */
const UNSUBSCRIBE_TTL_MS = 90 * DAY_MS

/** Monday 00:00 UTC of the week holding `day`. */
export function weekStartOf(day: Date): Date {
  const midnight = Date.UTC(day.getUTCFullYear(), day.getUTCMonth(), day.getUTCDate())
  const sinceMonday = (new Date(midnight).getUTCDay() + 6) % 7
  return new Date(midnight - sinceMonday * DAY_MS)
}

/** The last complete week (Monday to Sunday, UTC) before `now`. */
export function lastCompleteWeek(now: Date = new Date()): Date {
  return new Date(weekStartOf(now).getTime() - 7 * DAY_MS)
}

const isoDay = (d: Date): string => d.toISOString().slice(0, 10)

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

/** What one student's summary says about the week starting at `weekStart`. */
export async function summariseWeek(db: Knex, student: { id: number, name: string }, weekStart: Date): Promise<Omit<WeeklySummaryMail, 'unsubscribeLink' | 'appLink'>> {
  const weekEnd = new Date(weekStart.getTime() + 7 * DAY_MS)
  const attempts = await db('attempts').where('student_id', student.id)
    .where('started_at', '>=', weekStart).where('started_at', '<', weekEnd)
    .select('started_at', 'events', 'drill_id', 'score')
  const days = Array.from({ length: 7 }, (_, i) => ({ date: isoDay(new Date(weekStart.getTime() + i * DAY_MS)), minutes: 0, attempts: 0 }))
  for (const a of attempts) {
    const day = days[Math.floor((new Date(a.started_at).getTime() - weekStart.getTime()) / DAY_MS)]!
    day.attempts++
    day.minutes += attemptMinutes(parseEvents(a.events))
  }

  // Current assignments: not yet due when the week began (or with no due date), and given before it ended.
  const items: { due_at: Date | null, setTitle: string, drillId: number, drillTitle: string, target_score: number | null }[] = await assignmentsOfStudent(db, student.id).clone()
    .where(q => q.whereNull('a.due_at').orWhere('a.due_at', '>=', weekStart))
    .where('a.created_at', '<', weekEnd)
    .join('drill_sets as ds', 'ds.id', 'a.drill_set_id')
    .join('drill_set_items as dsi', 'dsi.drill_set_id', 'a.drill_set_id')
    .join('drills as d', 'd.id', 'dsi.drill_id')
    .orderBy([{ column: 'a.due_at' }, { column: 'a.id' }, { column: 'dsi.position' }])
    .select('a.due_at', 'ds.title as setTitle', 'd.id as drillId', 'd.title as drillTitle', 'dsi.target_score')
  const best = new Map<number, number>()
  for (const a of attempts) best.set(Number(a.drill_id), Math.max(best.get(Number(a.drill_id)) ?? 0, Number(a.score)))
  const targets = items.map(i => ({
    setTitle: i.setTitle,
    drillTitle: i.drillTitle,
    dueOn: i.due_at ? isoDay(new Date(i.due_at)) : null,
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
    weekStart: isoDay(weekStart),
    days,
    targets,
    comments: comments.map(c => ({ teacherName: c.teacherName, drillTitle: c.drillTitle, body: c.body, date: isoDay(new Date(c.created_at)) })),
  }
}

export interface WeeklyRun {
  weekStart: string
  queued: number
  alreadyQueued: number
}

/**
 * Queues the summary of the week starting `weekStart` (default: the last complete week) for every
 * student whose guardian has not stopped it. Each student's mail and its row in weekly_summaries
 * are written in one transaction, and that row's key (student, week) lets a week go out only once,
 * even when two instances run this at the same moment.
 */
export async function queueWeeklySummaries(db: Knex, options: { appUrl: string, weekStart?: Date }): Promise<WeeklyRun> {
  const weekStart = weekStartOf(options.weekStart ?? lastCompleteWeek())
  const base = options.appUrl.replace(/\/+$/, '')
  const students = await db('users').where('role', 'student').whereNotNull('guardian_email').whereNull('guardian_summary_stopped_at')
    .whereNotIn('id', db('weekly_summaries').where('week_start', isoDay(weekStart)).select('student_id'))
    .select('id', 'name', 'guardian_email')
  const run: WeeklyRun = { weekStart: isoDay(weekStart), queued: 0, alreadyQueued: 0 }
  for (const s of students) {
    const summary = await summariseWeek(db, { id: Number(s.id), name: s.name }, weekStart)
    try {
      await db.transaction(async (trx) => {
        await trx('weekly_summaries').insert({ student_id: s.id, week_start: isoDay(weekStart) })
        const token = await issueToken(trx, { kind: 'guardian-unsubscribe', userId: Number(s.id), subject: s.guardian_email, ttlMs: UNSUBSCRIBE_TTL_MS })
        const outboxId = await queueMail(trx, {
          to: s.guardian_email,
          template: 'weekly-summary',
          data: { ...summary, appLink: base, unsubscribeLink: `${base}/unsubscribe?token=${token}` },
        })
        await trx('weekly_summaries').where({ student_id: s.id, week_start: isoDay(weekStart) }).update({ outbox_id: outboxId })
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
