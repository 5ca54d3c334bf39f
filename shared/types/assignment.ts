import { z } from 'zod'
import { isTimeZone, todayIn } from '../utils/dueDate'
import { RowId } from './limits'

// Due instants are stored in a TIMESTAMP column, which ends in January 2038.
const LAST_DUE_DAY = '2037-12-31'

export const DueOn = z.string({ error: 'Choose a due date' }).regex(/^\d{4}-\d{2}-\d{2}$/, { error: 'Choose a due date' })
  .refine(s => !Number.isNaN(Date.parse(`${s}T00:00:00Z`)) && new Date(`${s}T00:00:00Z`).toISOString().startsWith(s), { error: 'Not a calendar date' })
  .refine(s => s >= '1970-01-02' && s <= LAST_DUE_DAY, { error: `Choose a date before ${LAST_DUE_DAY}` })

export const TimeZone = z.string().trim().min(1).max(64).refine(isTimeZone, { error: 'Unknown time zone' })

const Note = z.string().trim().max(2000, { error: 'At most 2000 characters' })

/** A due date may be today but not earlier, as the teacher's own calendar reads it. */
function notPast(input: { dueOn?: string, timeZone?: string }, ctx: z.RefinementCtx): void {
  if (input.dueOn && input.dueOn < todayIn(input.timeZone ?? 'UTC')) {
    ctx.addIssue({ code: 'custom', path: ['dueOn'], message: 'The due date is in the past' })
  }
}

export const AssignmentInput = z.object({
  drillSetId: RowId,
  classId: RowId.optional(),
  studentId: RowId.optional(),
  dueOn: DueOn,
  /** The teacher's time zone, in which `dueOn` is read; UTC when the browser does not say. */
  timeZone: TimeZone.optional(),
  note: Note.nullable().optional(),
}).superRefine((input, ctx) => {
  if ((input.classId === undefined) === (input.studentId === undefined)) {
    ctx.addIssue({ code: 'custom', path: ['classId'], message: 'Choose a class or one student' })
  }
  notPast(input, ctx)
})
export type AssignmentInput = z.infer<typeof AssignmentInput>

export const AssignmentPatch = z.object({
  dueOn: DueOn.optional(),
  timeZone: TimeZone.optional(),
  note: Note.nullable().optional(),
}).superRefine(notPast)
export type AssignmentPatch = z.infer<typeof AssignmentPatch>

