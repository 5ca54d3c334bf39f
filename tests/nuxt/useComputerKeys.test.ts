import { afterEach, describe, expect, it } from 'vitest'
import type { EffectScope } from 'vue'
import type { LiveNoteEvent } from '#shared/types/live'
import { COMPUTER_KEY_MAP, computerKeyNote, useComputerKeys } from '~/composables/useComputerKeys'
import type { ComputerKeysOptions } from '~/composables/useComputerKeys'

let scope: EffectScope | null = null
afterEach(() => scope?.stop())

function start(options: ComputerKeysOptions = {}): { keys: ReturnType<typeof useComputerKeys>, notes: LiveNoteEvent[] } {
  scope = effectScope()
  const keys = scope.run(() => useComputerKeys(options))!
  const notes: LiveNoteEvent[] = []
  keys.onNote(e => notes.push(e))
  return { keys, notes }
}

function key(type: 'keydown' | 'keyup', code: string, init: KeyboardEventInit = {}, target: EventTarget = window): KeyboardEvent {
  const event = new KeyboardEvent(type, { code, bubbles: true, cancelable: true, ...init })
  target.dispatchEvent(event)
  return event
}

describe('COMPUTER_KEY_MAP', () => {
  it('covers every semitone from C to F# an octave higher, once each', () => {
    expect(COMPUTER_KEY_MAP.map(k => k.semitone)).toEqual(Array.from({ length: 19 }, (_, i) => i))
    expect(new Set(COMPUTER_KEY_MAP.map(k => k.code)).size).toBe(COMPUTER_KEY_MAP.length)
  })

  it.each([
    ['KeyA', 4, 60],
    ['KeyW', 4, 61],
    ['KeyK', 4, 72],
    ['BracketRight', 4, 78],
    ['KeyA', 2, 36],
    ['KeyQ', 4, null],
  ])('plays %s in octave %i as %s', (code, octave, note) => {
    expect(computerKeyNote(code, octave)).toBe(note)
  })
})

describe('useComputerKeys', () => {
  it('plays a note on keydown and ends it on keyup, with the events’ own time stamps', () => {
    const { notes } = start({ velocity: 96 })
    const down = key('keydown', 'KeyD')
    const up = key('keyup', 'KeyD')
    expect(down.defaultPrevented).toBe(true)
    expect(notes).toEqual([
      { note: 64, on: true, velocity: 96, timeStampMs: down.timeStamp, source: 'computer-keys' },
      { note: 64, on: false, velocity: 0, timeStampMs: up.timeStamp, source: 'computer-keys' },
    ])
  })

  it('ignores auto-repeat while a key is held', () => {
    const { notes } = start()
    key('keydown', 'KeyA')
    key('keydown', 'KeyA', { repeat: true })
    key('keydown', 'KeyA', { repeat: true })
    key('keyup', 'KeyA')
    expect(notes.map(n => n.on)).toEqual([true, false])
  })

  it('shifts the octave with Z and X within its limits, and a held note ends where it began', () => {
    const octave = ref(4)
    const { notes } = start({ octave })
    key('keydown', 'KeyA')
    key('keydown', 'KeyX')
    expect(octave.value).toBe(5)
    key('keyup', 'KeyA')
    key('keydown', 'KeyA')
    expect(notes.map(n => [n.note, n.on])).toEqual([[60, true], [60, false], [72, true]])

    for (let i = 0; i < 10; i++) key('keydown', 'KeyZ')
    expect(octave.value).toBe(1)
  })

  it('leaves typing in a text field and shortcuts alone', () => {
    const { notes } = start()
    const field = document.createElement('input')
    document.body.append(field)
    key('keydown', 'KeyA', {}, field)
    key('keydown', 'KeyS', { ctrlKey: true })
    field.remove()
    expect(notes).toEqual([])
  })

  it('is silent while disabled and ends held notes when it is switched off', async () => {
    const enabled = ref(true)
    const { notes } = start({ enabled })
    key('keydown', 'KeyG')
    enabled.value = false
    await nextTick()
    key('keydown', 'KeyH')
    expect(notes.map(n => [n.note, n.on])).toEqual([[67, true], [67, false]])
  })
})
