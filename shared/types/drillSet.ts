import { z } from 'zod'
import { TEMPO_LIMITS } from '../utils/tempo'
import { RowId } from './limits'

/** A database id as a route parameter or a body field: a positive integer MariaDB's BIGINT holds exactly in JavaScript. */
export const Id = z.coerce.number({ error: 'Expected an id' }).int({ error: 'Expected an id' }).positive({ error: 'Expected an id' }).max(Number.MAX_SAFE_INTEGER)

export const IdParams = z.object({ id: Id })

export const DrillSetItemInput = z.object({
  drillId: RowId,
  /** The tempo the student works up to; the practice page never goes above it. */
  targetBpm: z.number().int().min(TEMPO_LIMITS.min).max(TEMPO_LIMITS.max).nullable().optional(),
  targetScore: z.number().int().min(0).max(100).nullable().optional(),
})
export type DrillSetItemInput = z.infer<typeof DrillSetItemInput>

const Title = z.string().trim().min(1, { error: 'Give the set a title' }).max(160, { error: 'At most 160 characters' })

/** The drills of a set in order; a drill appears once, since progress is counted per drill. */
const Items = z.array(DrillSetItemInput).max(100, { error: 'At most 100 drills in a set' })
  .refine(items => new Set(items.map(i => i.drillId)).size === items.length, { error: 'A drill appears only once in a set' })

export const DrillSetInput = z.object({ title: Title, items: Items })
export type DrillSetInput = z.infer<typeof DrillSetInput>

/** Any of a set's parts; `items` replaces the whole list (order, targets, drills added and removed). */
export const DrillSetPatch = z.object({
  title: Title.optional(),
  items: Items.optional(),
  archived: z.boolean().optional(),
})
export type DrillSetPatch = z.infer<typeof DrillSetPatch>
