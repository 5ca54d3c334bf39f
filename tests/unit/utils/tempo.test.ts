import { describe, expect, it } from 'vitest'
import { clampTempo } from '../../../shared/utils/tempo'

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
