import { z } from 'zod'
import { TEMPO_LIMITS } from '../utils/tempo'

/** A hand that plays a line. */
export const Hand = z.enum(['right', 'left'])
export type Hand = z.infer<typeof Hand>

/** A drill is written for one hand or for both. */
export const DrillHand = z.enum(['right', 'left', 'both'])
export type DrillHand = z.infer<typeof DrillHand>

/** Fingers are numbered 1 (thumb) to 5 (little finger) on both hands, as in printed fingering. */
export const Finger = z.number().int().min(1).max(5)
export type Finger = z.infer<typeof Finger>

/** What a drill trains; `other` for anything that is none of the named kinds. */
export const DrillKind = z.enum(['scale', 'arpeggio', 'five-finger', 'sequence', 'passage', 'other'])
export type DrillKind = z.infer<typeof DrillKind>

export const HandSize = z.enum(['small', 'medium', 'large'])
export type HandSize = z.infer<typeof HandSize>

/** A spelled pitch such as `C4`, `F#3`, `Bb5`, `F##4` or `Cb5` (scientific pitch notation, C4 = MIDI 60). */
export const PitchName = z.string().trim().regex(/^[A-Ga-g](?:#{1,2}|b{1,2})?-?\d$/, 'Expected a pitch such as C4, F#3 or Bb5')

/**
 * How a note is meant to sound beside its neighbours: `soft` (a quiet note, such as one marked p or pp)
 * or `accent` (a note that stands out, such as one marked > or f). Absent for an ordinary note.
 */
export const Emphasis = z.enum(['soft', 'accent'])
export type Emphasis = z.infer<typeof Emphasis>

export const DrillNote = z.object({
  pitch: PitchName,
  /** Onset in beats from the start of the drill. */
  beat: z.number().min(0).max(100_000),
  /** Written length in beats. */
  length: z.number().positive().max(64),
  /** Which hand plays it; required when the drill is for both hands. */
  hand: Hand.optional(),
  /** The planned finger; absent where the teacher left it open. */
  finger: Finger.nullable().optional(),
  emphasis: Emphasis.optional(),
})
export type DrillNote = z.infer<typeof DrillNote>

export const DrillMusic = z.object({
  hand: DrillHand,
  tempoBpm: z.number().int().min(TEMPO_LIMITS.min).max(TEMPO_LIMITS.max),
  notes: z.array(DrillNote).min(1).max(5000),
})
export type DrillMusic = z.infer<typeof DrillMusic>

/** Our own level scale for a drill, 1 (first lessons) to 8 (advanced). */
export const DrillLevel = z.number().int().min(1).max(8)

/** A time signature such as `4/4` or `6/8`. */
export const Meter = z.string().trim().regex(/^([1-9]|1\d|2\d|3[0-2])\/(1|2|4|8|16|32)$/, 'Write a time signature such as 4/4, 3/4 or 6/8')

/** A key such as `C major`, `F# minor` or `Bb major`. */
export const KeyName = z.string().trim().regex(/^[A-G](?:#|b| sharp| flat)? (?:major|minor)$/, 'Write a key such as C major, F# minor or Bb major')

export const DrillTags = z.array(z.string().trim().min(1, 'A tag cannot be empty').max(32, 'A tag has at most 32 characters')).max(12, 'At most 12 tags')
  .transform(tags => [...new Set(tags.map(t => t.toLowerCase()))])

/** The drill's details, as the editor's form and the API share them. */
const DrillDetails = z.object({
  title: z.string().trim().min(1, 'Give the drill a title').max(160, 'A title has at most 160 characters'),
  hand: DrillHand,
  tempoBpm: DrillMusic.shape.tempoBpm,
  meter: Meter.optional(),
  key: KeyName.nullable().optional(),
  level: DrillLevel.nullable().optional(),
  kind: DrillKind.optional(),
  tags: DrillTags.optional(),
  /** A note to the student, shown on the practice page. */
  description: z.string().trim().max(2000, 'A note has at most 2000 characters').nullable().optional(),
  source: z.enum(['typed', 'recorded', 'midi-file', 'musicxml']).optional(),
})

/** The drill notation as typed, at most about fifty lines of notes. */
export const NotationText = z.string().max(20_000, 'The notation has at most 20,000 characters')

/** A new drill: its notes either typed in the drill notation or given as a list. */
export const DrillInput = DrillDetails.extend({
  notation: NotationText.optional(),
  notes: DrillMusic.shape.notes.optional(),
}).refine(d => (d.notation === undefined) !== (d.notes === undefined), { message: 'Give the notes either as notation or as a list of notes, not both', path: ['notes'] })
export type DrillInput = z.infer<typeof DrillInput>

/** A change to a drill; `updatedAt` is the change the editor started from, so a later one elsewhere is not overwritten. */
export const DrillPatch = DrillDetails.partial().extend({
  notation: NotationText.optional(),
  notes: DrillMusic.shape.notes.optional(),
  updatedAt: z.iso.datetime({ offset: true }).optional(),
}).refine(d => d.notation === undefined || d.notes === undefined, { message: 'Give the notes either as notation or as a list of notes, not both', path: ['notes'] })
export type DrillPatch = z.infer<typeof DrillPatch>

export const DrillSort = z.enum(['title', 'updated'])

/** The library's search, filters and order. */
export const DrillListQuery = z.object({
  q: z.string().trim().max(100).optional(),
  hand: DrillHand.optional(),
  level: z.coerce.number().pipe(DrillLevel).optional(),
  kind: DrillKind.optional(),
  sort: DrillSort.optional(),
  archived: z.enum(['true', 'false']).transform(v => v === 'true').optional(),
})
export type DrillListQuery = z.infer<typeof DrillListQuery>

/** What the upload route reads beside the file, all as multipart text fields. */
export const DrillImportFields = z.object({
  part: z.coerce.number().int().min(1).max(1000).optional(),
  staff: z.enum(['1', '2', 'both']).transform(s => (s === 'both' ? 'both' as const : Number(s) as 1 | 2)).optional(),
  track: z.string().regex(/^\d{1,4}(,\d{1,4})?$/, 'Choose one track number, or two separated by a comma').transform(s => s.split(',').map(Number)).optional(),
  hand: Hand.optional(),
  measures: z.string().regex(/^\d{1,5}(-\d{1,5})?$/, 'Write a measure range such as 5-12').transform((s) => {
    const [from, to] = s.split('-').map(Number)
    return { from: from!, to: to ?? from! }
  }).optional(),
})
export type DrillImportFields = z.infer<typeof DrillImportFields>

/** A drill's id in a route. */
export const DrillIdParams = z.object({ id: z.coerce.number().int().positive().max(Number.MAX_SAFE_INTEGER) })
