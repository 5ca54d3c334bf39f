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

/**
 * A slow-to-target ladder: start at a share of the target, and after each pass that scores at least
 * `passScore`, go up by `stepBpm`; never above the target (the teacher's ceiling).
 */
export interface TempoLadder {
  /** 0.3–1: the share of the target to start from. */
  startShare: number
  stepBpm: number
  /** 0–100: the score a pass needs for the next rung. */
  passScore: number
}

export const DEFAULT_LADDER: TempoLadder = { startShare: 0.7, stepBpm: 4, passScore: 85 }

export function ladderStartBpm(targetBpm: number, ladder: TempoLadder): number {
  return clampTempo(targetBpm * Math.min(1, Math.max(0.3, ladder.startShare)), targetBpm)
}

/** The tempo for the next pass after one played at `currentBpm` that scored `score`. */
export function ladderNextBpm(currentBpm: number, score: number, targetBpm: number, ladder: TempoLadder): number {
  return score >= ladder.passScore ? clampTempo(currentBpm + Math.max(1, ladder.stepBpm), targetBpm) : clampTempo(currentBpm, targetBpm)
}
