import { z } from 'zod'

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
