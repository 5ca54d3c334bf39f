import { beforeEach, describe, expect, it } from 'vitest'
import { createPinia, setActivePinia } from 'pinia'
import { AttemptInput } from '#shared/types/attempt'
import type { LiveNoteEvent } from '#shared/types/live'
import { usePracticeStore } from '~/stores/practice'

const drill = { drillId: 7, drillVersion: 2, assignmentId: 11 }

function note(n: number, on: boolean, timeStampMs: number, velocity = on ? 80 : 0): LiveNoteEvent {
  return { note: n, on, velocity, timeStampMs, source: 'midi' }
}

beforeEach(() => {
  localStorage.clear()
  setActivePinia(createPinia())
})

describe('practice tempo', () => {
  it('never goes above the teacher’s target', () => {
    const practice = usePracticeStore()
    practice.setTargetTempo(96, 120)
    expect(practice.tempoBpm).toBe(96)
    practice.tempoBpm = 200
    expect(practice.tempoBpm).toBe(96)
    practice.tempoBpm = 72
    expect(practice.tempoBpm).toBe(72)
    practice.tempoBpm = 5
    expect(practice.tempoBpm).toBe(20)
  })

  it('comes down when a lower target is set and stays put on a bad write', () => {
    const practice = usePracticeStore()
    practice.setTargetTempo(null, 140)
    expect(practice.tempoBpm).toBe(140)
    practice.setTargetTempo(100)
    expect(practice.tempoBpm).toBe(100)
    practice.tempoBpm = Number.NaN
    expect(practice.tempoBpm).toBe(100)
  })

  it('refuses a target outside 20–320', () => {
    const practice = usePracticeStore()
    expect(() => practice.setTargetTempo(10)).toThrow('The target tempo must be between 20 and 320 beats per minute, got 10')
  })

  it('opens a drill at the teacher’s target, not at a default below it', () => {
    const practice = usePracticeStore()
    practice.openDrill(7, 84)
    expect(practice.tempoBpm).toBe(84)
  })

  it('opens a drill at the student’s lower chosen tempo on the next visit, never above a new target', () => {
    const practice = usePracticeStore()
    practice.openDrill(7, 84)
    practice.chooseTempo(66)
    practice.openDrill(8, 100)
    expect(practice.tempoBpm).toBe(100)
    setActivePinia(createPinia())
    const next = usePracticeStore()
    next.openDrill(7, 84)
    expect(next.tempoBpm).toBe(66)
    next.openDrill(7, 60)
    expect(next.tempoBpm).toBe(60)
    // Back at the ceiling the choice is forgotten, so a raised target opens at the target.
    next.openDrill(7, 84)
    next.chooseTempo(84)
    next.openDrill(7, 90)
    expect(next.tempoBpm).toBe(90)
  })

  it('plays the attempt at the clamped tempo', () => {
    const practice = usePracticeStore()
    practice.setTargetTempo(90, 150)
    practice.begin({ ...drill, timeZeroMs: 1000 })
    expect(practice.finish().tempoBpm).toBe(90)
  })
})

describe('practice settings', () => {
  it('are kept in local storage and read back by the next visit', () => {
    const practice = usePracticeStore()
    practice.soundOn = false
    practice.handSize = 'small'
    practice.keyMapOctave = 3
    setActivePinia(createPinia())
    const next = usePracticeStore()
    expect([next.soundOn, next.handSize, next.keyMapOctave]).toEqual([false, 'small', 3])
  })

  it('ignore values out of range', () => {
    const practice = usePracticeStore()
    practice.metronomeVolume = 0.4
    practice.metronomeVolume = 3
    practice.keyMapOctave = 12
    expect(practice.metronomeVolume).toBe(0.4)
    expect(practice.keyMapOctave).toBe(4)
  })

  it('fall back one by one when the stored copy is damaged', () => {
    localStorage.setItem('evenhand.practice-settings', JSON.stringify({ soundOn: false, handSize: 'huge', metronomeVolume: 'loud' }))
    const practice = usePracticeStore()
    expect([practice.soundOn, practice.handSize, practice.metronomeVolume]).toEqual([false, 'medium', 0.7])
  })
})

describe('the current attempt', () => {
  it('records events relative to time zero and finishes as a valid AttemptInput', () => {
    const practice = usePracticeStore()
    practice.setTargetTempo(null, 120)
    const started = practice.begin({ ...drill, deviceName: 'Stage Piano' })
    practice.record(note(60, true, 10_200))
    practice.setTimeZero(10_500)
    practice.record(note(60, false, 10_700.04))
    practice.record({ down: true, timeStampMs: 10_600, source: 'midi' })
    practice.record(note(62, true, 11_000))
    expect(practice.eventCount).toBe(4)

    const attempt = practice.finish()
    expect(AttemptInput.safeParse(attempt).success).toBe(true)
    expect(attempt).toMatchObject({
      id: started.id,
      drillId: 7,
      drillVersion: 2,
      assignmentId: 11,
      tempoBpm: 120,
      inputDevice: 'midi',
      deviceName: 'Stage Piano',
      startedAt: started.startedAt,
    })
    expect(attempt.id).toMatch(/^[0-9a-f-]{36}$/)
    expect(attempt.events).toEqual([
      { note: 60, on: true, velocity: 80, timeMs: -300 },
      { note: 60, on: false, velocity: 0, timeMs: 200 },
      { note: 62, on: true, velocity: 80, timeMs: 500 },
    ])
    expect(attempt.pedal).toEqual([{ down: true, timeMs: 100 }])
    expect(practice.current).toBeNull()
  })

  it('ignores notes when no attempt is being played', () => {
    const practice = usePracticeStore()
    practice.record(note(60, true, 1))
    expect(practice.eventCount).toBe(0)
  })

  it('gives each attempt its own id', () => {
    const practice = usePracticeStore()
    const first = practice.begin(drill).id
    expect(practice.begin(drill).id).not.toBe(first)
  })

  it('explains bad input', () => {
    const practice = usePracticeStore()
    expect(() => practice.begin({ ...drill, drillId: -1 })).toThrow(/drillId: expected a drill id/)
    practice.begin(drill)
    expect(() => practice.finish()).toThrow('The attempt has no time zero yet')
  })
})
