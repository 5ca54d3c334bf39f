import { afterEach, describe, expect, it } from 'vitest'
import type { EffectScope } from 'vue'
import { FRAME_MS, summariseLatency, useLatencyProbe } from '~/composables/useLatencyProbe'
import type { LatencyProbeOptions } from '~/composables/useLatencyProbe'

/** A frame scheduler driven by the test: `paint(t)` runs the waiting callbacks with the clock at t. */
function fakeFrames(): Required<Pick<LatencyProbeOptions, 'requestFrame' | 'cancelFrame' | 'now'>> & { paint: (atMs: number) => void, waiting: () => number } {
  let clock = 0
  let next = 1
  const callbacks = new Map<number, FrameRequestCallback>()
  return {
    requestFrame: (cb) => {
      callbacks.set(next, cb)
      return next++
    },
    cancelFrame: handle => callbacks.delete(handle),
    now: () => clock,
    paint: (atMs) => {
      clock = atMs
      const due = [...callbacks.values()]
      callbacks.clear()
      // The frame's own timestamp is deliberately earlier: the probe must not use it.
      due.forEach(cb => cb(atMs - 5))
    },
    waiting: () => callbacks.size,
  }
}

let scope: EffectScope | null = null
afterEach(() => {
  scope?.stop()
  scope = null
  delete window.__evenhandLatency
})

function start(options: LatencyProbeOptions): ReturnType<typeof useLatencyProbe> {
  scope = effectScope()
  return scope.run(() => useLatencyProbe(options))!
}

describe('summariseLatency', () => {
  it.each([
    ['an odd count', [9, 3, 12], 9, 12],
    ['an even count, as the mean of the middle two', [4, 10, 6, 30], 8, 30],
    ['one press', [7.5], 7.5, 7.5],
  ])('takes the median and worst of %s', (_, samples, median, worst) => {
    expect(summariseLatency(samples)).toEqual({ count: samples.length, medianMs: median, worstMs: worst, withinFrame: median <= FRAME_MS })
  })

  it('calls a median of one 60 Hz frame within, and anything above it not', () => {
    expect(FRAME_MS).toBeCloseTo(16.667, 3)
    expect(summariseLatency([FRAME_MS])!.withinFrame).toBe(true)
    expect(summariseLatency([16, 2, 40])!.withinFrame).toBe(true)
    expect(summariseLatency([16.8, 17, 2])!.withinFrame).toBe(false)
  })

  it('has nothing to say before the first press', () => {
    expect(summariseLatency([])).toBeNull()
  })
})

describe('useLatencyProbe', () => {
  it('times each press from its MIDI time stamp to the frame after it', () => {
    const frames = fakeFrames()
    const probe = start({ ...frames })
    probe.measure(100)
    frames.paint(108)
    probe.measure(200)
    probe.measure(204)
    frames.paint(221)
    expect(probe.samples.value).toEqual([8, 21, 17])
    expect(probe.summary.value).toEqual({ count: 3, medianMs: 17, worstMs: 21, withinFrame: false })
  })

  it('stops after the set number of presses, counting those still waiting for a frame', () => {
    const frames = fakeFrames()
    const probe = start({ ...frames, presses: 3 })
    probe.measure(0)
    frames.paint(4)
    probe.measure(10)
    probe.measure(20)
    probe.measure(30)
    expect(frames.waiting()).toBe(2)
    frames.paint(32)
    expect(probe.samples.value).toEqual([4, 22, 12])
    expect(probe.done.value).toBe(true)
    probe.measure(40)
    frames.paint(41)
    expect(probe.samples.value).toHaveLength(3)
  })

  it('starts again from nothing, dropping a press whose frame has not come yet', () => {
    const frames = fakeFrames()
    const probe = start({ ...frames, presses: 2 })
    probe.measure(0)
    frames.paint(10)
    probe.measure(20)
    probe.reset()
    frames.paint(30)
    expect(probe.samples.value).toEqual([])
    expect(probe.done.value).toBe(false)
    expect(probe.summary.value).toBeNull()
  })

  it('leaves the samples on the window only when asked to', () => {
    const frames = fakeFrames()
    start({ ...frames }).measure(50)
    frames.paint(56)
    expect(window.__evenhandLatency).toBeUndefined()
    scope?.stop()

    const exposed = start({ ...frames, expose: true })
    exposed.measure(60)
    frames.paint(63)
    expect(window.__evenhandLatency).toEqual([3])
    exposed.reset()
    expect(window.__evenhandLatency).toEqual([])
  })

  it('cancels frames still waiting when its owner goes away', () => {
    const frames = fakeFrames()
    start({ ...frames }).measure(0)
    scope?.stop()
    expect(frames.waiting()).toBe(0)
  })
})
