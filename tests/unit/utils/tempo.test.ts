import { describe, expect, it } from 'vitest'
import { clampTempo, DEFAULT_LADDER, ladderNextBpm, ladderStartBpm } from '../../../shared/utils/tempo'

describe('clampTempo', () => {
  it.each([
    [60, null, 60],
    [10, null, 20],
    [400, null, 320],
    [120, 96, 96],
    [96.4, 96, 96],
    [91, 90.5, 90.5],
    [72.6, 96, 73],
    [5, 96, 20],
  ])('clamps %s with target %s to %s', (bpm, target, expected) => {
    expect(clampTempo(bpm, target)).toBe(expected)
  })

  it('never returns more than the target', () => {
    for (let target = 20; target <= 320; target += 0.7) {
      for (const bpm of [target - 0.5, target, target + 0.3, target + 50]) expect(clampTempo(bpm, target)).toBeLessThanOrEqual(target)
    }
  })

  it('refuses a tempo that is not a number', () => {
    expect(() => clampTempo(Number.NaN, 90)).toThrow('Tempo must be a number of beats per minute, got NaN')
  })
})

describe('the slow-to-target ladder', () => {
  const ladder = { startShare: 0.7, stepBpm: 4, passScore: 85 }

  it('starts at the chosen share of the target, in whole beats', () => {
    expect(ladderStartBpm(84, ladder)).toBe(59)
    expect(ladderStartBpm(84, { ...ladder, startShare: 0.1 })).toBe(25)
    expect(ladderStartBpm(84, { ...ladder, startShare: 2 })).toBe(84)
  })

  it('climbs a step after a pass at or above the threshold and stays after one below it', () => {
    expect(ladderNextBpm(59, 85, 84, ladder)).toBe(63)
    expect(ladderNextBpm(59, 84.9, 84, ladder)).toBe(59)
  })

  it('never climbs above the teacher’s target, however many passes', () => {
    let bpm = ladderStartBpm(84, DEFAULT_LADDER)
    const rungs = [bpm]
    for (let pass = 0; pass < 20; pass++) {
      bpm = ladderNextBpm(bpm, 100, 84, DEFAULT_LADDER)
      rungs.push(bpm)
    }
    expect(Math.max(...rungs)).toBe(84)
    expect(rungs.at(-1)).toBe(84)
    expect(rungs.every((r, i) => i === 0 || r >= rungs[i - 1]!)).toBe(true)
  })
})
