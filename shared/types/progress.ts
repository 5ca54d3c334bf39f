import { z } from 'zod'
import type { FingerHabit } from '../engine'
import { RowId } from './limits'

/** How far back a progress page or the habits look. */
export const ProgressRange = z.enum(['2w', '3m', 'all'], { error: 'choose 2w, 3m or all' })
export type ProgressRange = z.infer<typeof ProgressRange>

export const RANGE_DAYS: Record<ProgressRange, number | null> = { '2w': 14, '3m': 91, 'all': null }

/** The browser's offset from UTC in minutes (as `-new Date().getTimezoneOffset()`), so days are the student's own. */
const TzOffset = z.coerce.number().int({ error: 'minutes east of UTC, a whole number' }).min(-840).max(840).default(0)

export const ProgressQuery = z.object({
  drill: z.coerce.number({ error: 'a drill id' }).pipe(RowId).optional(),
  range: ProgressRange.default('all'),
  tz: TzOffset,
})
export type ProgressQuery = z.infer<typeof ProgressQuery>

export const HabitsQuery = z.object({ range: ProgressRange.default('3m') })
export type HabitsQuery = z.infer<typeof HabitsQuery>

/** A page of a student's attempts, newest first. */
export const AttemptPageQuery = z.object({
  page: z.coerce.number({ error: 'a page number' }).int({ error: 'a whole page number' }).min(1, { error: 'pages start at 1' }).max(1_000_000).default(1),
})
export type AttemptPageQuery = z.infer<typeof AttemptPageQuery>

export const ATTEMPTS_PER_PAGE = 20

export const StudentParams = z.object({ id: z.coerce.number({ error: 'a student id' }).pipe(RowId) })

/** One attempt on a progress chart; every figure read from the attempt's stored grade. */
export interface ProgressPoint {
  attemptId: string
  startedAt: string
  score: number
  timingSdMs: number | null
  /** The timing spread as a percentage of one beat at the tempo played. */
  timingBeatPercent: number | null
  velocitySd: number | null
  positionsPlanned: number
  positionsPlayed: number
  playedBpm: number | null
}

/** A least-squares line over the points, as its values at the first and last attempt. */
export interface TrendLine {
  from: { at: string, value: number }
  to: { at: string, value: number }
  /** Change per week. */
  perWeek: number
}

export type ProgressFigure = 'score' | 'timingSdMs' | 'timingBeatPercent' | 'velocitySd' | 'positionsPlayed' | 'playedBpm'

export interface DrillProgress {
  student: { id: number, name: string }
  drill: { id: number, title: string, tempoBpm: number, positionsPlanned: number | null }
  range: ProgressRange
  /** From the student's latest-due assignment holding this drill; the drill's own tempo when none. */
  target: { score: number | null, tempoBpm: number }
  summary: { attempts: number, best: number | null, mean: number | null, bestBpm: number | null, first: string | null, last: string | null }
  points: ProgressPoint[]
  trends: Partial<Record<ProgressFigure, TrendLine>>
}

export interface DrillRecord {
  drillId: number
  title: string
  attempts: number
  best: number
  latest: number
  bestBpm: number | null
  latestBpm: number | null
  lastAt: string
}

export interface PracticeDay {
  /** YYYY-MM-DD in the student's time zone. */
  day: string
  minutes: number
  attempts: number
}

export interface ProgressOverview {
  student: { id: number, name: string }
  drills: DrillRecord[]
  /** The last 56 days, oldest first, days without practice included. */
  log: PracticeDay[]
  /** Days in a row with practice, ending today (or yesterday, when today has none yet). */
  streak: number
}

export interface HabitsView {
  student: { id: number, name: string }
  range: ProgressRange
  attempts: number
  fingers: (FingerHabit & { statement: string })[]
  shifts: { drillId: number, drillTitle: string, noteIndex: number, pitch: string | null, times: number, attempts: number }[]
}

/** One attempt in a student's list: what a teacher scans before opening it. */
export interface StudentAttemptRow {
  id: string
  drillId: number
  drillTitle: string
  startedAt: string
  score: number
  tempoBpm: number
  playedBpm: number | null
  inputDevice: string
  part: { fromBar: number, toBar: number, hand: string | null } | null
  comments: number
}

export interface StudentAttemptsPage {
  student: { id: number, name: string }
  attempts: StudentAttemptRow[]
  page: number
  perPage: number
  total: number
}
