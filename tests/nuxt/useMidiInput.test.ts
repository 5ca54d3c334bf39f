import { afterEach, beforeEach, describe, expect, it } from 'vitest'
import type { EffectScope } from 'vue'
import type { LiveNoteEvent, LivePedalEvent } from '#shared/types/live'
import { useMidiInput } from '~/composables/useMidiInput'
import type { MidiInput } from '~/composables/useMidiInput'
import { FakeMidiAccess, FakeMidiInput, installMidi } from './fakeMidi'

let scope: EffectScope | null = null
let restore: (() => void) | null = null

function start(access: (() => Promise<FakeMidiAccess>) | undefined): MidiInput {
  restore = installMidi(access)
  scope = effectScope()
  return scope.run(() => useMidiInput())!
}

function record(midi: MidiInput): { notes: LiveNoteEvent[], pedal: LivePedalEvent[] } {
  const notes: LiveNoteEvent[] = []
  const pedal: LivePedalEvent[] = []
  midi.onNote(e => notes.push(e))
  midi.onPedal(e => pedal.push(e))
  return { notes, pedal }
}

beforeEach(() => localStorage.clear())
afterEach(() => {
  scope?.stop()
  restore?.()
  scope = null
  restore = null
})

describe('useMidiInput', () => {
  it('reports notes and pedal with the timestamps of the MIDI messages', async () => {
    const keys = new FakeMidiInput('in-1', 'Stage Piano')
    const midi = start(async () => new FakeMidiAccess([keys]))
    const { notes, pedal } = record(midi)

    expect(await midi.enable()).toBe('ready')
    expect(midi.inputs.value).toEqual([{ id: 'in-1', name: 'Stage Piano', manufacturer: 'Evenhand Test Works', state: 'connected' }])
    expect(midi.selected.value?.id).toBe('in-1')
    expect(midi.message.value).toBe('Listening to “Stage Piano”.')

    keys.send([0x90, 60, 90], 1000.25)
    keys.send([0xB0, 64, 127], 1010.5)
    keys.send([0x90, 60, 0], 1250.75)
    keys.send([0xB0, 64, 0], 1300)
    // Channel 5, a note-off with its release velocity, the pedal's threshold, and messages to ignore.
    keys.send([0x94, 61, 1], 1400)
    keys.send([0x84, 61, 40], 1450)
    keys.send([0xB0, 64, 64], 1500)
    keys.send([0xB0, 64, 63], 1550)
    keys.send([0xB0, 7, 100], 1600)
    keys.send([0xC0, 3], 1650)
    keys.send([0xD0, 50], 1700)

    // MIDI 1.0: a note-on with velocity 0 is a note-off; controller 64 is down from 64 up.
    expect(notes).toEqual([
      { note: 60, on: true, velocity: 90, timeStampMs: 1000.25, source: 'midi' },
      { note: 60, on: false, velocity: 0, timeStampMs: 1250.75, source: 'midi' },
      { note: 61, on: true, velocity: 1, timeStampMs: 1400, source: 'midi' },
      { note: 61, on: false, velocity: 40, timeStampMs: 1450, source: 'midi' },
    ])
    expect(pedal).toEqual([
      { down: true, timeStampMs: 1010.5, source: 'midi' },
      { down: false, timeStampMs: 1300, source: 'midi' },
      { down: true, timeStampMs: 1500, source: 'midi' },
      { down: false, timeStampMs: 1550, source: 'midi' },
    ])
  })

  it('falls back while the chosen device is unplugged and goes back to it when it returns', async () => {
    const first = new FakeMidiInput('in-a', 'Practice Keys')
    const chosen = new FakeMidiInput('in-b', 'Grand Controller')
    const access = new FakeMidiAccess([first, chosen])
    const midi = start(async () => access)
    const { notes } = record(midi)
    await midi.enable()
    midi.select('in-b')
    expect(midi.selected.value?.id).toBe('in-b')

    access.unplug(chosen)
    await nextTick()
    expect(midi.status.value).toBe('ready')
    expect(midi.selected.value?.id).toBe('in-a')
    expect(midi.rememberedId.value).toBe('in-b')
    expect(midi.message.value).toContain('“Grand Controller” is unplugged')

    access.plugIn(chosen)
    await nextTick()
    expect(midi.selected.value?.id).toBe('in-b')

    first.send([0x90, 50, 70], 1)
    chosen.send([0x90, 52, 80], 2)
    expect(notes.map(n => n.note)).toEqual([52])
  })

  it('says no device is connected after the only one is unplugged, and recovers on re-plug', async () => {
    const keys = new FakeMidiInput('in-1', 'Stage Piano')
    const access = new FakeMidiAccess([keys])
    const midi = start(async () => access)
    const { notes } = record(midi)
    await midi.enable()
    midi.select('in-1')

    access.unplug(keys)
    await nextTick()
    expect(midi.status.value).toBe('no-devices')
    expect(midi.selected.value).toBeNull()
    expect(midi.message.value).toContain('“Stage Piano” is not connected')

    access.plugIn(keys)
    await nextTick()
    expect(midi.status.value).toBe('ready')
    keys.send([0x90, 64, 64], 5)
    expect(notes).toHaveLength(1)
  })

  it('handles a browser that keeps an unplugged port listed as disconnected', async () => {
    const first = new FakeMidiInput('in-a', 'Practice Keys')
    const chosen = new FakeMidiInput('in-b', 'Grand Controller')
    const access = new FakeMidiAccess([first, chosen])
    const midi = start(async () => access)
    await midi.enable()
    midi.select('in-b')

    access.unplug(chosen, { keepListed: true })
    await nextTick()
    expect(midi.inputs.value.map(i => [i.id, i.state])).toEqual([['in-a', 'connected'], ['in-b', 'disconnected']])
    expect(midi.selected.value?.id).toBe('in-a')

    access.plugIn(chosen)
    await nextTick()
    expect(midi.selected.value?.id).toBe('in-b')
  })

  it('asks the browser once when enable() is called twice at once', async () => {
    let asked = 0
    const midi = start(async () => {
      asked++
      return new FakeMidiAccess([new FakeMidiInput('in-1', 'Stage Piano')])
    })
    expect(await Promise.all([midi.enable(), midi.enable()])).toEqual(['ready', 'ready'])
    expect(asked).toBe(1)
  })

  it('re-selects the remembered device on the next visit', async () => {
    const devices = (): FakeMidiInput[] => [new FakeMidiInput('in-a', 'Practice Keys'), new FakeMidiInput('in-b', 'Grand Controller')]
    const visit = start(async () => new FakeMidiAccess(devices()))
    await visit.enable()
    visit.select('in-b')
    scope!.stop()
    restore!()

    const next = start(async () => new FakeMidiAccess(devices()))
    await next.enable()
    expect(next.selected.value?.id).toBe('in-b')
  })

  it('refuses to select a device that is not connected', async () => {
    const midi = start(async () => new FakeMidiAccess([new FakeMidiInput('in-1', 'Stage Piano')]))
    await midi.enable()
    expect(() => midi.select('in-9')).toThrow('No connected MIDI input has the id “in-9”.')
  })

  it('reports no devices when none is plugged in', async () => {
    const midi = start(async () => new FakeMidiAccess([]))
    expect(await midi.enable()).toBe('no-devices')
    expect(midi.message.value).toContain('No MIDI keyboard found')
  })

  it('reports a browser without Web MIDI as unsupported', async () => {
    const midi = start(undefined)
    expect(await midi.enable()).toBe('unsupported')
    expect(midi.message.value).toContain('no Web MIDI')
  })

  it('reports a refused permission as denied', async () => {
    const midi = start(() => Promise.reject(new DOMException('Permission denied', 'SecurityError')))
    expect(await midi.enable()).toBe('denied')
    expect(midi.message.value).toContain('MIDI access was refused')
  })

  it('reports other failures with their reason', async () => {
    const midi = start(() => Promise.reject(new Error('MIDI service crashed')))
    expect(await midi.enable()).toBe('error')
    expect(midi.message.value).toBe('MIDI could not be started: MIDI service crashed')
  })
})
