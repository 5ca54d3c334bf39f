import type { Knex } from 'knex'
import { z } from 'zod'
import type { User } from '#auth-utils'
import type { AttemptInput, AttemptListQuery, AttemptPart } from '#shared/types/attempt'
import type { DrillHand, DrillNote } from '#shared/types/drill'
import { beatsPerBar, drillPart } from '#shared/utils/part'
import { trustedEvents } from '#shared/utils/timeline'
import { ENGINE_VERSION, gradeAttempt, type GradeResult } from '#shared/engine'

export const AttemptParams = z.object({ id: z.uuid({ error: 'not an attempt id' }) })

export interface AttemptSummary {
  id: string
  studentId: number
  drillId: number
  drillVersion: number
  assignmentId: number | null
  startedAt: string
  tempoBpm: number
  inputDevice: string
  score: number
  timingSdMs: number | null
  velocitySd: number | null
  positionChanges: { planned: number, played: number }
  accuracy: GradeResult['accuracy']
  engineVersion: string
}

export interface AttemptDetail extends AttemptSummary {
  /** The bars and hand played, when not the whole drill; the result indexes that part's notes. */
  part: AttemptPart | null
  deviceName: string | null
  events: AttemptInput['events']
  pedal: NonNullable<AttemptInput['pedal']>
  result: GradeResult
  comments: { id: number, teacherId: number, teacherName: string, body: string, createdAt: string, readAt: string | null }[]
}

type AttemptRow = Record<string, unknown>

export function toAttemptSummary(row: AttemptRow): AttemptSummary {
  const result = parseJson<GradeResult>(row.result)
  return {
    id: String(row.id),
    studentId: Number(row.student_id),
    drillId: Number(row.drill_id),
    drillVersion: Number(row.drill_version),
    assignmentId: row.assignment_id == null ? null : Number(row.assignment_id),
    startedAt: new Date(row.started_at as string).toISOString(),
    tempoBpm: Number(row.tempo_bpm),
    inputDevice: String(row.input_device),
    score: Number(row.score),
    timingSdMs: result.timing.sdMs,
    velocitySd: result.loudness.sd,
    positionChanges: { planned: result.positionChanges.planned, played: result.positionChanges.played },
    accuracy: result.accuracy,
    engineVersion: String(row.engine_version),
  }
}

type CommentRow = Record<string, unknown>

/** A whole attempt from its row (JSON columns as text, or as the values about to be stored) and its comments. */
function toAttemptDetail(row: AttemptRow, comments: CommentRow[]): AttemptDetail {
  return {
    ...toAttemptSummary(row),
    deviceName: (row.device_name as string | null) ?? null,
    part: row.part_from_bar == null ? null : { fromBar: Number(row.part_from_bar), toBar: Number(row.part_to_bar), hand: (row.part_hand as AttemptPart['hand']) ?? null },
    events: parseJson(row.events),
    pedal: row.pedal ? parseJson(row.pedal) : [],
    result: parseJson(row.result),
    comments: comments.map(c => ({ id: Number(c.id), teacherId: Number(c.teacher_id), teacherName: String(c.name), body: String(c.body), createdAt: new Date(c.created_at as string).toISOString(), readAt: c.read_at ? new Date(c.read_at as string).toISOString() : null })),
  }
}

/** The columns a list needs; raw events stay out of lists because they are the bulk of a row. */
export const SUMMARY_COLUMNS = ['id', 'student_id', 'drill_id', 'drill_version', 'assignment_id', 'started_at', 'tempo_bpm', 'input_device', 'score', 'result', 'engine_version']

export interface AttemptPage {
  attempts: AttemptSummary[]
  /** Pass as `cursor` for the next (older) page; null on the last page. */
  nextCursor: string | null
}

/**
 * The attempts `user` may see, newest first, one page at a time. Paged by (started_at, id) rather than by
 * offset, so a page costs the same however deep it is and an attempt saved meanwhile neither repeats nor
 * skips a row of the pages after it.
 */
export async function listAttempts(db: Knex, user: User, { drill, student, limit, cursor }: AttemptListQuery): Promise<AttemptPage> {
  const q = db('attempts').select(SUMMARY_COLUMNS)
    .orderBy([{ column: 'started_at', order: 'desc' }, { column: 'id', order: 'desc' }])
    .limit(limit + 1)
  if (drill) q.where('drill_id', drill)
  if (user.role === 'student') {
    if (student && student !== user.id) throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: 'Students see only their own attempts' })
    q.where('student_id', user.id)
  }
  else if (user.role === 'teacher') {
    q.whereIn('student_id', taughtStudentIds(db, user.id))
    if (student) q.where('student_id', student)
  }
  else if (student) {
    q.where('student_id', student)
  }
  if (cursor) {
    const at = new Date(cursor.at)
    q.where(w => w.where('started_at', '<', at).orWhere(same => same.where('started_at', at).where('id', '<', cursor.id)))
  }
  const rows = await q
  const page = rows.slice(0, limit).map(toAttemptSummary)
  const last = page.at(-1)
  return { attempts: page, nextCursor: rows.length > limit && last ? `${last.startedAt}_${last.id}` : null }
}

export async function loadAttempt(db: Knex, id: string): Promise<AttemptDetail | undefined> {
  const row = await db('attempts').where({ id }).first()
  if (!row) return undefined
  const comments = await db('comments as c').join('users as u', 'u.id', 'c.teacher_id')
    .where('c.attempt_id', id).orderBy('c.created_at')
    .select('c.id', 'c.teacher_id', 'u.name', 'c.body', 'c.created_at', 'c.read_at')
  return toAttemptDetail(row, comments)
}

interface PlayedDrill { hand: DrillHand, tempoBpm: number, meter: string, notes: DrillNote[], targetBpm: number }

/**
 * The drill version an attempt was played on and the tempo it was played against, in one query: a 404 for a
 * drill the student may not open, a 400 for a version that does not exist or an assignment without the drill.
 */
async function playedDrill(db: Knex, student: User, input: AttemptInput): Promise<PlayedDrill> {
  const columns = ['d.meter', 'v.version', 'v.hand', 'v.tempo_bpm', 'v.notes']
  const q = db('drills as d')
    .leftJoin('drill_versions as v', j => j.on('v.drill_id', 'd.id').andOnVal('v.version', input.drillVersion))
    .where('d.id', input.drillId).whereIn('d.id', visibleDrillIds(db, student))
  if (input.assignmentId) {
    const item = assignmentsOfStudent(db, student.id).clone()
      .join('drill_set_items as dsi', 'dsi.drill_set_id', 'a.drill_set_id')
      .where('a.id', input.assignmentId).where('dsi.drill_id', input.drillId)
      .select('dsi.drill_id', 'dsi.target_tempo_bpm').limit(1)
    q.leftJoin(item.as('item'), 'item.drill_id', 'd.id')
    columns.push('item.drill_id as item_drill_id', 'item.target_tempo_bpm as item_tempo_bpm')
  }
  const row = await q.first(columns)
  if (!row) throw createError({ statusCode: 404, statusMessage: 'Not found', message: 'drillId: Drill not found' })
  if (row.version == null) throw createError({ statusCode: 400, statusMessage: 'Invalid input', message: 'drillVersion: This version of the drill does not exist' })
  if (input.assignmentId && row.item_drill_id == null) throw createError({ statusCode: 400, statusMessage: 'Invalid input', message: 'assignmentId: This assignment does not include the drill' })
  const tempoBpm = Number(row.tempo_bpm)
  return { hand: row.hand, tempoBpm, meter: row.meter, notes: parseJson<DrillNote[]>(row.notes), targetBpm: row.item_tempo_bpm == null ? tempoBpm : Number(row.item_tempo_bpm) }
}

/**
 * Grades an attempt on the server from its raw events (the browser's figures are never trusted) and stores it.
 * Idempotent on the client's id: a second save of the same attempt returns the stored one. A new attempt, the
 * common case, costs two queries (the drill, the insert) and is answered from the values stored, not read back;
 * a copy already stored shows as a duplicate key, or, when its drill has since been hidden or changed, is
 * looked for before the refusal.
 */
export async function saveAttempt(db: Knex, student: User, input: AttemptInput): Promise<{ attempt: AttemptDetail, created: boolean }> {
  let drill: PlayedDrill
  try {
    drill = await playedDrill(db, student, input)
  }
  catch (error) {
    if (await db('attempts').where({ id: input.id }).first('id')) return { attempt: await ownStored(db, student, input.id), created: false }
    throw error
  }

  const events = trustedEvents(input.events, input.inputDevice)
  const part = drillPart({ hand: drill.hand, tempoBpm: drill.tempoBpm, notes: drill.notes }, input.part, beatsPerBar(drill.meter))
  if (!part) throw createError({ statusCode: 400, statusMessage: 'Invalid input', message: 'part: These bars hold no notes for that hand' })
  const result = gradeAttempt(part.music, events, { targetBpm: drill.targetBpm })
  const row = {
    id: input.id,
    student_id: student.id,
    drill_id: input.drillId,
    drill_version: input.drillVersion,
    assignment_id: input.assignmentId ?? null,
    started_at: new Date(input.startedAt),
    // Rounded here to the column's tenth (DECIMAL(5,1)), so the answer holds what is stored.
    tempo_bpm: Math.round(input.tempoBpm * 10) / 10,
    input_device: input.inputDevice,
    // As stored in utf8mb4: a lone surrogate becomes U+FFFD.
    device_name: input.deviceName?.toWellFormed() ?? null,
    part_from_bar: input.part?.fromBar ?? null,
    part_to_bar: input.part?.toBar ?? null,
    part_hand: input.part?.hand ?? null,
    score: Math.round(result.score),
    engine_version: ENGINE_VERSION,
  }
  try {
    await insertPrepared(db, 'attempts', { ...row, events: JSON.stringify(events), pedal: input.pedal ? JSON.stringify(input.pedal) : null, result: JSON.stringify(result) })
  }
  catch (error) {
    // Two copies of one attempt racing in (or a copy sent again): the first insert wins, the others read it back.
    if ((error as { code?: string }).code !== 'ER_DUP_ENTRY') throw error
    return { attempt: await ownStored(db, student, input.id), created: false }
  }
  return { attempt: toAttemptDetail({ ...row, events, pedal: input.pedal ?? null, result }, []), created: true }
}

async function ownStored(db: Knex, student: User, id: string): Promise<AttemptDetail> {
  const attempt = await loadAttempt(db, id)
  if (!attempt || attempt.studentId !== student.id) {
    throw createError({ statusCode: 409, statusMessage: 'Conflict', message: 'id: This attempt id is already taken' })
  }
  return attempt
}
