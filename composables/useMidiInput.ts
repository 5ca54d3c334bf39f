import type { ControlChangeMessageEvent, Input, Listener, NoteMessageEvent } from 'webmidi'
import { createEventHook, createSharedComposable, tryOnScopeDispose, useLocalStorage } from '@vueuse/core'
import type { EventHookOn } from '@vueuse/core'
import { z } from 'zod'
import type { LiveNoteEvent, LivePedalEvent } from '#shared/types/live'

export type MidiStatus = 'idle' | 'enabling' | 'unsupported' | 'denied' | 'error' | 'no-devices' | 'ready'

export interface MidiInputInfo {
  id: string
  name: string
  manufacturer: string
  state: 'connected' | 'disconnected'
}

const RememberedInput = z.object({ id: z.string().min(1), name: z.string() }).nullable()
type RememberedInput = z.infer<typeof RememberedInput>

const STORAGE_KEY = 'evenhand.midi-input'
/** MIDI 1.0's damper (sustain) pedal controller. */
const SUSTAIN_PEDAL = 64

// webmidi is one object per page; a new enable() must wait until the last disable() has
// finished, or it would find the old MIDIAccess still in place and skip asking for a new one.
let released: Promise<unknown> = Promise.resolve()

function isPermissionError(error: unknown): boolean {
  const name = (error as { name?: unknown } | null)?.name
  return name === 'SecurityError' || name === 'NotAllowedError'
}

function toInfo(input: Input): MidiInputInfo {
  return {
    id: input.id,
    name: input.name || 'Unnamed MIDI input',
    manufacturer: input.manufacturer ?? '',
    state: input.state === 'connected' ? 'connected' : 'disconnected',
  }
}

function describe(status: MidiStatus, remembered: RememberedInput, listening: MidiInputInfo | null, failure: string): string {
  switch (status) {
    case 'idle': return 'MIDI is not switched on yet.'
    case 'enabling': return 'Asking the browser for your MIDI devices…'
    case 'unsupported': return 'This browser has no Web MIDI, so a MIDI keyboard cannot be used here. Try a Chromium-based browser or Firefox, or play on the computer keys or the on-screen keys.'
    case 'denied': return 'MIDI access was refused. Allow MIDI devices for this site in the browser’s site settings and try again, or play on the computer keys or the on-screen keys.'
    case 'error': return `MIDI could not be started: ${failure}`
    case 'no-devices': return remembered
      ? `“${remembered.name}” is not connected. Plug it in and switch it on; it will be picked up by itself.`
      : 'No MIDI keyboard found. Plug one in and switch it on; it will be picked up by itself.'
    case 'ready': return remembered && listening && remembered.id !== listening.id
      ? `Listening to “${listening.name}” while “${remembered.name}” is unplugged.`
      : `Listening to “${listening?.name ?? ''}”.`
  }
}

export interface MidiInput {
  status: Readonly<Ref<MidiStatus>>
  /** A sentence for the student that says what the status means and what to do. */
  message: ComputedRef<string>
  /** Every input the browser reports, plugged in or not. */
  inputs: Readonly<Ref<readonly MidiInputInfo[]>>
  /** The input being listened to now (another one while the remembered device is unplugged). */
  selected: ComputedRef<MidiInputInfo | null>
  /** The input the student chose, kept across visits; null until they choose. */
  rememberedId: ComputedRef<string | null>
  enable: () => Promise<MidiStatus>
  select: (id: string) => void
  onNote: EventHookOn<LiveNoteEvent>
  onPedal: EventHookOn<LivePedalEvent>
}

function createMidiInput(): MidiInput {
  const remembered = useLocalStorage<RememberedInput>(STORAGE_KEY, null, {
    serializer: validatedSerializer(RememberedInput, () => null),
    // Written at once, so a choice is kept even if the page goes right after. vueuse pauses its
    // writer until the next tick after each write when it also listens to storage events, which
    // would drop a second write in the same tick; another tab's choice matters only on reload.
    flush: 'sync',
    listenToStorageChanges: false,
  })
  const status = ref<MidiStatus>('idle')
  const failure = ref('')
  const inputs = shallowRef<MidiInputInfo[]>([])
  const listeningId = ref<string | null>(null)
  const noteHook = createEventHook<LiveNoteEvent>()
  const pedalHook = createEventHook<LivePedalEvent>()

  let midi: typeof import('webmidi').WebMidi | null = null
  let attached: { input: Input, listeners: Listener[] } | null = null

  const listening = computed<MidiInputInfo | null>(() => inputs.value.find(i => i.id === listeningId.value) ?? null)
  const message = computed(() => describe(status.value, remembered.value, listening.value, failure.value))

  // webmidi's own events, stamped with the MIDI message's time: it reads a note-on at velocity 0
  // as a note-off (running status), and `rawValue` is the message's 0–127 byte unchanged. We set no
  // octave offset, so `note.number` is the message's note number.
  function onNoteOn(e: NoteMessageEvent): void {
    void noteHook.trigger({ note: e.note.number, on: true, velocity: e.rawValue ?? 0, timeStampMs: e.timestamp, source: 'midi' })
  }
  function onNoteOff(e: NoteMessageEvent): void {
    void noteHook.trigger({ note: e.note.number, on: false, velocity: e.rawValue ?? 0, timeStampMs: e.timestamp, source: 'midi' })
  }
  function onControl(e: ControlChangeMessageEvent): void {
    if (e.controller.number !== SUSTAIN_PEDAL) return
    // The MIDI 1.0 convention for switch controllers: 0–63 is up, 64–127 is down.
    void pedalHook.trigger({ down: (e.rawValue ?? 0) >= 64, timeStampMs: e.timestamp, source: 'midi' })
  }

  function attach(input: Input | null): void {
    if (attached?.input === input) return
    attached?.listeners.forEach(l => l.remove())
    attached = null
    if (input) {
      attached = {
        input,
        listeners: [
          input.addListener('noteon', onNoteOn),
          input.addListener('noteoff', onNoteOff),
          input.addListener('controlchange', onControl),
        ].flat(),
      }
    }
    listeningId.value = input?.id ?? null
  }

  /** The remembered device when it is plugged in, else the first one that is. */
  function pickInput(connected: Input[]): Input | null {
    const wanted = remembered.value
    if (wanted) {
      // Some systems give a device a new id when it goes into another USB port; the name stays.
      const match = connected.find(i => i.id === wanted.id) ?? connected.find(i => i.name === wanted.name)
      if (match) return match
    }
    return connected[0] ?? null
  }

  function refresh(): void {
    if (!midi) return
    const all = midi.inputs
    inputs.value = all.map(toInfo)
    attach(pickInput(all.filter(i => i.state === 'connected')))
    status.value = attached ? 'ready' : 'no-devices'
  }

  async function start(): Promise<MidiStatus> {
    status.value = 'enabling'
    const { WebMidi } = await import('webmidi')
    await released
    try {
      await WebMidi.enable()
    }
    catch (error) {
      failure.value = error instanceof Error ? error.message : String(error)
      status.value = isPermissionError(error) ? 'denied' : 'error'
      return status.value
    }
    midi = WebMidi
    WebMidi.addListener('connected', refresh)
    WebMidi.addListener('disconnected', refresh)
    refresh()
    return status.value
  }

  let starting: Promise<MidiStatus> | null = null

  /**
   * Asks the browser for MIDI access (it may prompt) and starts listening; client only. Calls
   * while one is under way share it; after `denied` or `error`, a new call asks again.
   */
  function enable(): Promise<MidiStatus> {
    if (import.meta.server || midi) return Promise.resolve(status.value)
    if (typeof navigator === 'undefined' || typeof navigator.requestMIDIAccess !== 'function') {
      status.value = 'unsupported'
      return Promise.resolve(status.value)
    }
    starting ??= start().finally(() => {
      starting = null
    })
    return starting
  }

  /** Listens to the input with this id from now on, and remembers it for the next visit. */
  function select(id: string): void {
    const input = midi?.inputs.find(i => i.id === id && i.state === 'connected')
    if (!input) throw new Error(`No connected MIDI input has the id “${id}”.`)
    remembered.value = { id: input.id, name: input.name }
    refresh()
  }

  tryOnScopeDispose(() => {
    attach(null)
    if (!midi) return
    midi.removeListener('connected', refresh)
    midi.removeListener('disconnected', refresh)
    released = midi.disable()
    midi = null
  })

  return {
    status: readonly(status),
    message,
    inputs: readonly(inputs),
    selected: listening,
    rememberedId: computed(() => remembered.value?.id ?? null),
    enable,
    select,
    onNote: noteHook.on,
    onPedal: pedalHook.on,
  }
}

/**
 * MIDI keyboards through webmidi, shared by every component that asks for it: one MIDIAccess,
 * one listener per input, released when the last user unmounts.
 */
export const useMidiInput: () => MidiInput = createSharedComposable(createMidiInput)
