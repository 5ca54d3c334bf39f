import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { mockNuxtImport } from '@nuxt/test-utils/runtime'

// A fake audio clock and tone: the metronome's arithmetic is checked without a sound card.
const fake = vi.hoisted(() => {
  const state = {
    audioNow: 10,
    hits: [] as { hz: number, time: number, velocity: number }[],
    disposed: 0,
    gains: [] as number[],
  }
  class Synth {
    connect(): this { return this }
    triggerAttackRelease(hz: number, _duration: number, time: number, velocity: number): void {
      state.hits.push({ hz, time, velocity })
    }

    dispose(): void { state.disposed++ }
  }
  class Gain {
    gain = { rampTo: (value: number) => state.gains.push(value) }
    toDestination(): this { return this }
  }
  const tone = { start: () => Promise.resolve(), Synth, Gain }
  return { state, tone }
})

mockNuxtImport('loadTone', () => () => Promise.resolve(fake.tone))
mockNuxtImport('audioNow', () => () => fake.state.audioNow)
// Audio second t is heard at performance.now() 5000 + 1000 t.
mockNuxtImport('audioTimeToPerformanceMs', () => (t: number) => 5000 + t * 1000)

describe('useMetronome', () => {
  beforeEach(() => {
    vi.useFakeTimers()
    Object.assign(fake.state, { audioNow: 10, hits: [], disposed: 0, gains: [] })
  })
  afterEach(() => vi.useRealTimers())

  it('counts in, accents downbeats, keeps exact beat spacing and reports time zero on the performance clock', async () => {
    const metronome = useMetronome()
    const beats: { index: number, isDownbeat: boolean, isCountIn: boolean, timeMs: number }[] = []
    const { zeroMs } = await metronome.start({ bpm: 120, beatsPerBar: 3, countInBars: 2, onBeat: b => beats.push(b) })

    // First click 0.1 s after start; 2 bars of 3 beats at 0.5 s precede beat 0.
    expect(zeroMs).toBeCloseTo(5000 + (10.1 + 6 * 0.5) * 1000, 6)
    fake.state.audioNow = 14
    vi.advanceTimersByTime(30_000)

    const times = fake.state.hits.map(h => h.time)
    expect(times).toHaveLength(9)
    times.slice(1).forEach((t, i) => expect(t - times[i]!).toBeCloseTo(0.5, 9))
    const accented = fake.state.hits.flatMap((h, i) => (h.velocity === 1 ? [i] : []))
    expect(accented).toEqual([0, 3, 6])
    expect(new Set(accented.map(i => fake.state.hits[i]!.hz)).size).toBe(1)
    expect(fake.state.hits[1]!.hz).toBeLessThan(fake.state.hits[0]!.hz)

    expect(beats.map(b => b.index)).toEqual([-6, -5, -4, -3, -2, -1, 0, 1, 2])
    expect(beats.filter(b => b.isCountIn)).toHaveLength(6)
    expect(beats.filter(b => b.isDownbeat).map(b => b.index)).toEqual([-6, -3, 0])
    expect(beats.find(b => b.index === 0)!.timeMs).toBeCloseTo(zeroMs, 6)
    expect(metronome.beat.value).toEqual(beats.at(-1))
    metronome.stop()
    expect(metronome.beat.value).toBeNull()
  })

  it('plays a slow tempo as given, never raised to a floor', async () => {
    const metronome = useMetronome()
    await metronome.start({ bpm: 12, beatsPerBar: 4, countInBars: 0 })
    fake.state.audioNow = 30
    vi.advanceTimersByTime(1000)
    const times = fake.state.hits.map(h => h.time)
    expect(times).toEqual([10.1, 15.1, 20.1, 25.1, 30.1].map(t => expect.closeTo(t, 9)))
    metronome.stop()
  })

  it('refuses a tempo it cannot play instead of picking another', async () => {
    const metronome = useMetronome()
    await expect(metronome.start({ bpm: 0, beatsPerBar: 4 })).rejects.toThrow(RangeError)
    await expect(metronome.start({ bpm: Number.NaN, beatsPerBar: 4 })).rejects.toThrow(RangeError)
    expect(fake.state.hits).toHaveLength(0)
  })

  it('goes silent on stop and schedules nothing more', async () => {
    const metronome = useMetronome()
    await metronome.start({ bpm: 60, beatsPerBar: 4, countInBars: 1 })
    expect(metronome.running.value).toBe(true)
    metronome.stop()
    expect(metronome.running.value).toBe(false)
    expect(fake.state.disposed).toBe(1)
    const before = fake.state.hits.length
    fake.state.audioNow = 100
    vi.advanceTimersByTime(10_000)
    expect(fake.state.hits).toHaveLength(before)
  })

  it('mutes and sets its own volume', async () => {
    const metronome = useMetronome()
    await metronome.start({ bpm: 60, beatsPerBar: 4 })
    metronome.volume.value = 0.3
    await nextTick()
    metronome.muted.value = true
    await nextTick()
    expect(fake.state.gains).toEqual([0.3, 0])
    metronome.stop()
  })
})
