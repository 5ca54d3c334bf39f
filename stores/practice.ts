import { useLocalStorage } from '@vueuse/core'
import { skipHydrate } from 'pinia'
import { z } from 'zod'
import { AttemptInput, InputDevice } from '#shared/types/attempt'
import { HandSize } from '#shared/types/drill'
import type { LiveNoteEvent, LivePedalEvent } from '#shared/types/live'
import { clampTempo, TEMPO_LIMITS } from '#shared/utils/tempo'
import { playedInput, toPedalEvents, toPlayedEvents } from '#shared/utils/timeline'
import { COMPUTER_KEYS_OCTAVE, COMPUTER_KEYS_VELOCITY } from '~/composables/useComputerKeys'

// Each field falls back on its own, so one bad value left by an older release keeps the rest.
const PracticeSettings = z.object({
  inputDevice: InputDevice.catch('midi'),
  soundOn: z.boolean().catch(true),
  metronomeVolume: z.number().min(0).max(1).catch(0.7),
  metronomeMuted: z.boolean().catch(false),
  handSize: HandSize.catch('medium'),
  keyMapOctave: z.number().int().min(COMPUTER_KEYS_OCTAVE.min).max(COMPUTER_KEYS_OCTAVE.max).catch(COMPUTER_KEYS_OCTAVE.default),
  computerKeysVelocity: z.number().int().min(1).max(127).catch(COMPUTER_KEYS_VELOCITY),
  /** Hide everything but the drill, the keyboard and the status while playing. */
  focusMode: z.boolean().catch(false),
  /** The tempo the student last chose for each drill (by id), when it was below the ceiling then. */
  chosenTempos: z.record(z.string().regex(/^\d{1,10}$/), z.number().int().min(TEMPO_LIMITS.min).max(TEMPO_LIMITS.max)).catch({}),
})
export type PracticeSettings = z.infer<typeof PracticeSettings>

const BeginAttempt = z.object({
  drillId: z.number().int().positive({ error: 'drillId: expected a drill id' }),
  drillVersion: z.number().int().positive({ error: 'drillVersion: expected a drill version' }),
  assignmentId: z.number().int().positive({ error: 'assignmentId: expected an assignment id' }).nullable().default(null),
  /** The input the notes come from; the chosen input in the settings when absent. */
  inputDevice: InputDevice.optional(),
  deviceName: z.string().trim().max(200).optional(),
  /** performance.now() of beat 0, when already known; else call setTimeZero() once it is. */
  timeZeroMs: z.number().nonnegative().optional(),
})
export type BeginAttempt = z.input<typeof BeginAttempt>

/** What is known about the attempt being played; the events themselves are kept apart. */
export interface CurrentAttempt {
  id: string
  drillId: number
  drillVersion: number
  assignmentId: number | null
  startedAt: string
  tempoBpm: number
  inputDevice: InputDevice
  deviceName?: string
  timeZeroMs: number | null
}

const MAX_EVENTS = 20_000
const MAX_PEDAL_EVENTS = 5_000

export const usePracticeStore = defineStore('practice', () => {
  const settings = useLocalStorage<PracticeSettings>('evenhand.practice-settings', PracticeSettings.parse({}), {
    serializer: validatedSerializer(PracticeSettings, () => PracticeSettings.parse({})),
    mergeDefaults: true,
    // As in useMidiInput: every write stored at once, none lost to vueuse's pause after a write.
    flush: 'sync',
    listenToStorageChanges: false,
  })

  /** A setting as a writable ref whose writes are checked like a stored value is on reading. */
  function setting<K extends keyof PracticeSettings>(key: K): WritableComputedRef<PracticeSettings[K]> {
    // Without its `.catch`: a bad write keeps the old value rather than resetting to the default.
    const field = PracticeSettings.shape[key].unwrap()
    return computed({
      get: () => settings.value[key],
      set: (value) => {
        if (field.safeParse(value).success) settings.value = { ...settings.value, [key]: value }
      },
    })
  }

  const inputDevice = setting('inputDevice')
  const soundOn = setting('soundOn')
  const metronomeVolume = setting('metronomeVolume')
  const metronomeMuted = setting('metronomeMuted')
  const handSize = setting('handSize')
  const keyMapOctave = setting('keyMapOctave')
  const computerKeysVelocity = setting('computerKeysVelocity')
  const focusMode = setting('focusMode')

  const targetBpm = ref<number | null>(null)
  const chosenBpm = ref(80)
  /** The tempo to practise at; writes are clamped to [20, target] and a lower target pulls it down. */
  const tempoBpm = computed<number>({
    get: () => clampTempo(chosenBpm.value, targetBpm.value),
    set: (bpm) => {
      if (Number.isFinite(bpm)) chosenBpm.value = clampTempo(bpm, targetBpm.value)
    },
  })
  const openDrillId = ref<number | null>(null)

  /**
   * Opens a drill at its ceiling (the teacher's target, else the drill's tempo), or at the tempo the
   * student last chose for it when that is lower: a perfect run at the opening tempo reaches the
   * tempo the grade compares with.
   */
  function openDrill(drillId: number, ceilingBpm: number): void {
    openDrillId.value = null
    setTargetTempo(ceilingBpm, settings.value.chosenTempos[String(drillId)] ?? ceilingBpm)
    openDrillId.value = drillId
  }

  /** The student's own choice of tempo for the open drill, remembered for the next visit. */
  function chooseTempo(bpm: number): void {
    tempoBpm.value = bpm
    const id = openDrillId.value
    if (id === null) return
    const { [String(id)]: _previous, ...others } = settings.value.chosenTempos
    // At the ceiling there is nothing to remember: the drill opens there anyway.
    const chosenTempos = tempoBpm.value < (targetBpm.value ?? TEMPO_LIMITS.max) ? { ...others, [String(id)]: tempoBpm.value } : others
    settings.value = { ...settings.value, chosenTempos }
  }

  /** Sets the teacher's ceiling (null: none) and, optionally, the tempo to start from. */
  function setTargetTempo(target: number | null, startBpm?: number): void {
    if (target !== null && !(Number.isFinite(target) && target >= TEMPO_LIMITS.min && target <= TEMPO_LIMITS.max)) {
      throw new RangeError(`The target tempo must be between ${TEMPO_LIMITS.min} and ${TEMPO_LIMITS.max} beats per minute, got ${target}`)
    }
    targetBpm.value = target
    if (startBpm !== undefined) tempoBpm.value = startBpm
  }

  const current = shallowRef<CurrentAttempt | null>(null)
  // Plain arrays: a note arrives every few milliseconds in a fast run, and nothing needs to
  // re-render per note except what watches `eventCount`.
  let notes: LiveNoteEvent[] = []
  let pedal: LivePedalEvent[] = []
  const eventCount = ref(0)

  function begin(input: BeginAttempt): CurrentAttempt {
    const parsed = BeginAttempt.safeParse(input)
    if (!parsed.success) throw new Error(`Cannot start the attempt: ${z.prettifyError(parsed.error)}`)
    const { timeZeroMs, ...rest } = parsed.data
    notes = []
    pedal = []
    eventCount.value = 0
    current.value = {
      ...rest,
      id: crypto.randomUUID(),
      startedAt: new Date().toISOString(),
      tempoBpm: tempoBpm.value,
      inputDevice: rest.inputDevice ?? inputDevice.value,
      timeZeroMs: timeZeroMs ?? null,
    }
    return current.value
  }

  /** performance.now() of beat 0, from the metronome once its count-in is scheduled. */
  function setTimeZero(timeZeroMs: number): void {
    if (!current.value) throw new Error('No attempt is being played')
    if (!Number.isFinite(timeZeroMs)) throw new RangeError(`Time zero must be a performance.now() time, got ${timeZeroMs}`)
    current.value = { ...current.value, timeZeroMs }
  }

  /** Keeps a note or pedal change for the current attempt; ignored when none is being played. */
  function record(e: LiveNoteEvent | LivePedalEvent): void {
    if (!current.value) return
    if ('note' in e) {
      if (notes.length >= MAX_EVENTS) return
      notes.push(e)
    }
    else {
      if (pedal.length >= MAX_PEDAL_EVENTS) return
      pedal.push(e)
    }
    eventCount.value++
  }

  /** Ends the attempt and gives it in the form the server accepts; throws if it does not fit. */
  function finish(): AttemptInput {
    const attempt = current.value
    if (!attempt) throw new Error('No attempt is being played')
    const { timeZeroMs, ...meta } = attempt
    if (timeZeroMs === null) throw new Error('The attempt has no time zero yet: call setTimeZero() when the count-in is scheduled')
    const parsed = AttemptInput.safeParse({
      ...meta,
      // What was really played on, whatever was chosen: it decides whether velocities count.
      inputDevice: playedInput(notes, meta.inputDevice),
      events: toPlayedEvents(notes, timeZeroMs, meta.tempoBpm),
      pedal: toPedalEvents(pedal, timeZeroMs, meta.tempoBpm),
    })
    // The attempt stays current on failure, so what was played is still there to inspect.
    if (!parsed.success) throw new Error(`The attempt cannot be saved: ${z.prettifyError(parsed.error)}`)
    cancel()
    return parsed.data
  }

  /** Drops the current attempt (the student stopped to start again). */
  function cancel(): void {
    current.value = null
    notes = []
    pedal = []
    eventCount.value = 0
  }

  // Read-only views are getters (computed), not state: Pinia would try to write server-rendered
  // values into readonly refs on hydration. The stored settings are this browser's, so the
  // server's defaults must not replace them either (skipHydrate).
  return {
    settings: skipHydrate(settings),
    inputDevice,
    soundOn,
    metronomeVolume,
    metronomeMuted,
    handSize,
    keyMapOctave,
    computerKeysVelocity,
    focusMode,
    targetBpm: computed(() => targetBpm.value),
    tempoBpm,
    setTargetTempo,
    openDrill,
    chooseTempo,
    current: computed(() => current.value),
    eventCount: computed(() => eventCount.value),
    begin,
    setTimeZero,
    record,
    finish,
    cancel,
  }
})

if (import.meta.hot) import.meta.hot.accept(acceptHMRUpdate(usePracticeStore, import.meta.hot))
