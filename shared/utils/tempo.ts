/** The tempi an attempt may be played at (the same bounds AttemptInput accepts). */
export const TEMPO_LIMITS = { min: 20, max: 320 } as const

/**
 * A practice tempo in whole beats per minute, within the limits and never above the teacher's
 * target when one is set: the target is a ceiling for safety, so that a student does not build
 * speed before the movement is secure.
 */
export function clampTempo(bpm: number, targetBpm: number | null = null): number {
  if (!Number.isFinite(bpm)) throw new RangeError(`Tempo must be a number of beats per minute, got ${bpm}`)
  const ceiling = targetBpm === null ? TEMPO_LIMITS.max : Math.min(TEMPO_LIMITS.max, targetBpm)
  // Rounded before the ceiling is applied, so that a fractional target is never rounded past.
  return Math.min(ceiling, Math.max(TEMPO_LIMITS.min, Math.round(bpm)))
}
