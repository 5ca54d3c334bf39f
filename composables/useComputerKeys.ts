import { createEventHook, useEventListener } from '@vueuse/core'
import type { EventHookOn } from '@vueuse/core'
import type { LiveNoteEvent } from '#shared/types/live'

export interface ComputerKey {
  /** `KeyboardEvent.code`: the physical key, so the layout is the same on QWERTY, AZERTY or QWERTZ. */
  code: string
  /** What is printed on that key on a US keyboard, for the settings page. */
  label: string
  /** Semitones above the C of the chosen octave. */
  semitone: number
}

/**
 * The home row plays the white keys from C to F an octave and a half higher; the row above
 * plays the black keys, each sitting between the two white keys it lies between on a piano
 * (R, I and [ have no black key, as there is none between E–F and B–C). One hand's drills fit
 * in this span; Z and X move it down or up an octave.
 */
export const COMPUTER_KEY_MAP: readonly ComputerKey[] = [
  { code: 'KeyA', label: 'A', semitone: 0 },
  { code: 'KeyW', label: 'W', semitone: 1 },
  { code: 'KeyS', label: 'S', semitone: 2 },
  { code: 'KeyE', label: 'E', semitone: 3 },
  { code: 'KeyD', label: 'D', semitone: 4 },
  { code: 'KeyF', label: 'F', semitone: 5 },
  { code: 'KeyT', label: 'T', semitone: 6 },
  { code: 'KeyG', label: 'G', semitone: 7 },
  { code: 'KeyY', label: 'Y', semitone: 8 },
  { code: 'KeyH', label: 'H', semitone: 9 },
  { code: 'KeyU', label: 'U', semitone: 10 },
  { code: 'KeyJ', label: 'J', semitone: 11 },
  { code: 'KeyK', label: 'K', semitone: 12 },
  { code: 'KeyO', label: 'O', semitone: 13 },
  { code: 'KeyL', label: 'L', semitone: 14 },
  { code: 'KeyP', label: 'P', semitone: 15 },
  { code: 'Semicolon', label: ';', semitone: 16 },
  { code: 'Quote', label: '\'', semitone: 17 },
  { code: 'BracketRight', label: ']', semitone: 18 },
]

export const OCTAVE_DOWN_KEY: Pick<ComputerKey, 'code' | 'label'> = { code: 'KeyZ', label: 'Z' }
export const OCTAVE_UP_KEY: Pick<ComputerKey, 'code' | 'label'> = { code: 'KeyX', label: 'X' }

/** The octave whose C the A key plays, in scientific pitch notation (C4 = MIDI 60). */
export const COMPUTER_KEYS_OCTAVE = { min: 1, max: 6, default: 4 } as const
export const COMPUTER_KEYS_VELOCITY = 80

const SEMITONE_BY_CODE = new Map(COMPUTER_KEY_MAP.map(k => [k.code, k.semitone]))

/** The MIDI note a key plays in an octave, or null for a key outside the map. */
export function computerKeyNote(code: string, octave: number): number | null {
  const semitone = SEMITONE_BY_CODE.get(code)
  return semitone === undefined ? null : 12 * (octave + 1) + semitone
}

export function clampOctave(octave: number): number {
  if (!Number.isFinite(octave)) return COMPUTER_KEYS_OCTAVE.default
  return Math.min(COMPUTER_KEYS_OCTAVE.max, Math.max(COMPUTER_KEYS_OCTAVE.min, Math.round(octave)))
}

function isTyping(target: EventTarget | null): boolean {
  if (!(target instanceof HTMLElement)) return false
  return target.isContentEditable || target.tagName === 'INPUT' || target.tagName === 'TEXTAREA' || target.tagName === 'SELECT'
}

export interface ComputerKeysOptions {
  /** Shared with the settings (the practice store's `keyMapOctave`); a local ref when absent. */
  octave?: Ref<number>
  /** 0–127 for every note, as a computer key cannot tell how hard it was struck. */
  velocity?: MaybeRefOrGetter<number>
  /** Listen only while this is true (e.g. while the computer keys are the chosen input). */
  enabled?: MaybeRefOrGetter<boolean>
}

export interface ComputerKeys {
  octave: Ref<number>
  shiftOctave: (by: number) => void
  /** Ends every held note, e.g. when the attempt stops while keys are still down. */
  releaseAll: (timeStampMs?: number) => void
  onNote: EventHookOn<LiveNoteEvent>
}

/** Plays notes from the computer keyboard (see COMPUTER_KEY_MAP) while the page has focus. */
export function useComputerKeys(options: ComputerKeysOptions = {}): ComputerKeys {
  const octave = options.octave ?? ref<number>(COMPUTER_KEYS_OCTAVE.default)
  const noteHook = createEventHook<LiveNoteEvent>()
  // Which note each held key started, so a release ends that note even after an octave shift.
  const held = new Map<string, number>()

  function emit(note: number, on: boolean, timeStampMs: number): void {
    const velocity = on ? Math.min(127, Math.max(1, Math.round(toValue(options.velocity) ?? COMPUTER_KEYS_VELOCITY))) : 0
    void noteHook.trigger({ note, on, velocity, timeStampMs, source: 'computer-keys' })
  }

  function releaseAll(timeStampMs: number = performance.now()): void {
    for (const note of held.values()) emit(note, false, timeStampMs)
    held.clear()
  }

  function shiftOctave(by: number): void {
    octave.value = clampOctave(octave.value + by)
  }

  function onKeyDown(e: KeyboardEvent): void {
    if (e.ctrlKey || e.metaKey || e.altKey || isTyping(e.target)) return
    if (e.code === OCTAVE_DOWN_KEY.code || e.code === OCTAVE_UP_KEY.code) {
      e.preventDefault()
      if (!e.repeat) shiftOctave(e.code === OCTAVE_UP_KEY.code ? 1 : -1)
      return
    }
    const note = computerKeyNote(e.code, clampOctave(octave.value))
    if (note === null) return
    // Stops the browser's own use of the key (Firefox's quick find on ' for one).
    e.preventDefault()
    // A held key repeats keydown; a note already sounding from another key after an octave shift
    // would be a second note-on without a note-off between.
    if (e.repeat || held.has(e.code) || [...held.values()].includes(note)) return
    held.set(e.code, note)
    emit(note, true, e.timeStamp)
  }

  function onKeyUp(e: KeyboardEvent): void {
    const note = held.get(e.code)
    if (note === undefined) return
    e.preventDefault()
    held.delete(e.code)
    emit(note, false, e.timeStamp)
  }

  const target = computed(() => (import.meta.client && toValue(options.enabled ?? true) ? window : null))
  useEventListener(target, 'keydown', onKeyDown)
  useEventListener(target, 'keyup', onKeyUp)
  // Keys released while another window has focus never send keyup.
  useEventListener(target, 'blur', () => releaseAll())
  watch(target, (now) => {
    if (!now) releaseAll()
  })

  return { octave, shiftOctave, releaseAll, onNote: noteHook.on }
}
