import { z } from 'zod'
import { Hand } from './drill'
import { TEMPO_LIMITS } from '../utils/tempo'
import { INT_UNSIGNED_MAX, RowId, StoredTimestamp } from './limits'

/** One key press or release as captured from MIDI or the on-screen keys; times in ms from the attempt's start. */
export const PlayedEvent = z.object({
  note: z.number().int().min(0).max(127),
  on: z.boolean(),
  velocity: z.number().int().min(0).max(127).optional(),
  timeMs: z.number().min(-60_000).max(3_600_000),
})
export type PlayedEvent = z.infer<typeof PlayedEvent>

/** Sustain pedal (MIDI control change 64) changes, kept with the attempt for the teacher. */
export const PedalEvent = z.object({
  down: z.boolean(),
  timeMs: z.number().min(-60_000).max(3_600_000),
})
export type PedalEvent = z.infer<typeof PedalEvent>

export const InputDevice = z.enum(['midi', 'screen', 'computer-keys'])
export type InputDevice = z.infer<typeof InputDevice>

/**
 * The part of a drill an attempt played, when not the whole: whole bars (1-based, inclusive) and
 * optionally one hand of a both-hands drill. The attempt is graded against those notes only.
 */
export const AttemptPart = z.object({
  fromBar: z.number().int().min(1).max(10_000),
  toBar: z.number().int().min(1).max(10_000),
  hand: Hand.nullable().default(null),
}).refine(p => p.toBar >= p.fromBar, { message: 'must not be before fromBar', path: ['toBar'] })
export type AttemptPart = z.infer<typeof AttemptPart>

/** What the browser sends to save an attempt; the server recomputes every grade from `events`. */
export const AttemptInput = z.object({
  /** Chosen by the client so that sending the same attempt twice stores it once. */
  id: z.uuid(),
  drillId: RowId,
  drillVersion: z.number().int().positive().max(INT_UNSIGNED_MAX),
  assignmentId: RowId.nullable().optional(),
  startedAt: StoredTimestamp,
  tempoBpm: z.number().min(TEMPO_LIMITS.min).max(TEMPO_LIMITS.max),
  inputDevice: InputDevice,
  deviceName: z.string().trim().max(200).optional(),
  events: z.array(PlayedEvent).max(20_000),
  pedal: z.array(PedalEvent).max(5_000).optional(),
  part: AttemptPart.nullable().optional(),
})
export type AttemptInput = z.infer<typeof AttemptInput>

/** Where a page of an attempt list ended: the last attempt's start and id, written `<ISO time>_<id>`. */
export const AttemptCursor = z.string().max(80).transform((text, ctx) => {
  const [at, id, ...rest] = text.split('_')
  const parsed = z.object({ at: StoredTimestamp, id: z.uuid() }).safeParse({ at, id })
  if (rest.length > 0 || !parsed.success) {
    ctx.issues.push({ code: 'custom', message: 'not the nextCursor of an earlier page', input: text })
    return z.NEVER
  }
  return parsed.data
})

/** An attempt list, newest first, one page at a time: `nextCursor` of one page asks for the next. */
export const AttemptListQuery = z.object({
  drill: z.coerce.number().pipe(RowId).optional(),
  student: z.coerce.number().pipe(RowId).optional(),
  limit: z.coerce.number().int().min(1).max(100).default(50),
  cursor: AttemptCursor.optional(),
})
export type AttemptListQuery = z.infer<typeof AttemptListQuery>
