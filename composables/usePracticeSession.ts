// One practice session on one drill: the inputs wired to the piano and the recording, the count-in,
// the guide through the drill, grading and saving. The practice page keeps only the layout.
//   const session = usePracticeSession({ drill, assignmentId, ceilingBpm })
//   session.state – one typed state: ready → counting → playing → done (with the grade and its saving)
//   session.start(), session.finish(), session.stop(); session.press/release for the on-screen keys
import { gradeAttempt, midiFromName, type GradeResult } from '#shared/engine'
import type { InputDevice } from '#shared/types/attempt'
import type { DrillMusic, DrillNote } from '#shared/types/drill'
import type { LiveNoteEvent, LivePedalEvent } from '#shared/types/live'

export interface PracticeDrill extends DrillMusic {
  id: number
  version: number
  meter: string
  notes: DrillNote[]
}

export type SaveState =
  | { status: 'saving' }
  | { status: 'saved' }
  | { status: 'waiting' | 'rejected', message: string }

export type PracticeState =
  | { phase: 'ready' }
  | { phase: 'counting' }
  | { phase: 'playing' }
  | { phase: 'done', result: GradeResult, save: SaveState, tempoBpm: number }

export interface PracticeSessionOptions {
  drill: Ref<PracticeDrill | null>
  assignmentId: Ref<number | null>
  /** The teacher's target for this assignment, else the drill's own tempo: the tempo is never above it. */
  ceilingBpm: Ref<number | null>
  /** Called once the server has stored an attempt (to refresh the history beside the page). */
  onSaved?: () => void
}

/** Whole octaves from C around the notes, so the hand sees where it is; never past the 88 keys. */
export function keyboardRange(notes: readonly number[]): { low: number, high: number } {
  const all = notes.length ? notes : [60]
  const low = Math.max(21, Math.floor((Math.min(...all) - 2) / 12) * 12)
  const high = Math.min(108, Math.ceil((Math.max(...all) + 2) / 12) * 12)
  return { low, high: Math.max(high, low + 12) }
}

/** Just the notes' span and a key either side, for a narrow screen held upright. */
export function tightRange(notes: readonly number[]): { low: number, high: number } {
  const all = notes.length ? notes : [60]
  return { low: Math.max(21, Math.min(...all) - 1), high: Math.min(108, Math.max(...all) + 1) }
}

/** Notes that start together (a chord, or both hands) are one step to play, in order of their beat. */
export function stepsOf(notes: readonly DrillNote[]): number[][] {
  const byBeat = new Map<number, number[]>()
  notes.forEach((n, i) => byBeat.set(n.beat, [...(byBeat.get(n.beat) ?? []), i]))
  return [...byBeat.entries()].sort((a, b) => a[0] - b[0]).map(([, ix]) => ix)
}

export function usePracticeSession(options: PracticeSessionOptions) {
  const { drill, assignmentId, ceilingBpm } = options
  const store = usePracticeStore()
  const piano = usePiano()
  const metronome = useMetronome({ volume: toRef(store, 'metronomeVolume'), muted: toRef(store, 'metronomeMuted') })
  const midi = useMidiInput()
  const outbox = useAttemptOutbox()

  watch(() => [drill.value?.id, ceilingBpm.value] as const, ([id, ceiling]) => {
    if (id !== undefined && ceiling) store.openDrill(id, ceiling)
  }, { immediate: true })
  watch(() => store.soundOn, (on) => {
    piano.enabled.value = on
  }, { immediate: true })

  const music = computed<DrillMusic | null>(() => drill.value && { hand: drill.value.hand, tempoBpm: drill.value.tempoBpm, notes: drill.value.notes })
  const midiOf = computed(() => (drill.value?.notes ?? []).map(n => midiFromName(n.pitch)))
  const beatsPerBar = computed(() => Number(drill.value?.meter.split('/')[0]) || 4)
  // Grading no performance at all yields the plan's own position changes, computed exactly as the grade will.
  const plannedAt = computed(() => (music.value ? gradeAttempt(music.value, []).positionChanges.plannedAt : []))
  const steps = computed(() => stepsOf(drill.value?.notes ?? []))
  const range = computed(() => keyboardRange(midiOf.value))
  const narrowRange = computed(() => tightRange(midiOf.value))

  const state = shallowRef<PracticeState>({ phase: 'ready' })
  const active = computed(() => state.value.phase === 'counting' || state.value.phase === 'playing')
  const result = computed(() => (state.value.phase === 'done' ? state.value.result : null))
  /** One sentence for screen readers at each moment a player needs: count-in, start, end, result. */
  const announcement = ref('')
  const error = ref('')
  const pressed = reactive(new Set<number>())

  // The step the notes have reached, and the step the guide (keyboard marks, note strip, counter) shows.
  // The guide follows after the frame that lights the played key: re-rendering it in the same task
  // would hold that frame back (see onNote).
  let step = 0
  const stepIndex = ref(0)
  let stepHits = new Set<number>()
  let guidePending = false

  const targets = computed(() => {
    const current = steps.value[stepIndex.value]
    if (state.value.phase === 'done' || !current) return []
    return current.map(i => midiOf.value[i]!)
  })
  const fingers = computed(() => {
    const notes = drill.value?.notes ?? []
    const shown = state.value.phase === 'done' ? notes.map((_, i) => i) : steps.value[stepIndex.value] ?? []
    return shown.flatMap(i => (notes[i]?.finger ? [{ midi: midiOf.value[i]!, finger: notes[i]!.finger! }] : []))
  })
  const inferredKeys = computed(() => (result.value?.inferredFingers ?? []).flatMap((f, i) => (f.finger ? [{ midi: midiOf.value[i]!, finger: f.finger }] : [])))
  const shiftKeys = computed(() => (result.value ? result.value.positionChanges.at.map(i => midiOf.value[i]!) : []))

  function showStep(): void {
    if (guidePending) return
    guidePending = true
    afterNextPaint(() => {
      guidePending = false
      stepIndex.value = step
    })
  }

  function advance(note: number): void {
    const notes = steps.value[step]
    if (!notes) return
    const wanted = notes.map(i => midiOf.value[i]!)
    if (wanted.includes(note)) stepHits.add(note)
    // A wrong key moves on too, so the guide follows the student rather than waiting for a correction.
    if (stepHits.size >= new Set(wanted).size || !wanted.includes(note)) {
      step++
      stepHits = new Set()
      showStep()
    }
    if (step >= steps.value.length && state.value.phase === 'playing') scheduleFinish()
  }

  let finishTimer: ReturnType<typeof setTimeout> | null = null
  function scheduleFinish(): void {
    // Give the last note its written length before closing the attempt.
    finishTimer ??= setTimeout(() => void finish(), (60_000 / store.tempoBpm) * 1.5)
  }
  function clearFinish(): void {
    if (finishTimer) clearTimeout(finishTimer)
    finishTimer = null
  }

  // Only the key and its sound belong to the note's own frame; what else the note changes waits for
  // that frame to be drawn (showStep), and the recording is a plain push that nothing renders.
  function onNote(e: LiveNoteEvent): void {
    if (e.on) {
      pressed.add(e.note)
      piano.noteOn(e.note, e.velocity)
    }
    else {
      pressed.delete(e.note)
      piano.noteOff(e.note)
    }
    const phase = state.value.phase
    if (phase === 'counting' || phase === 'playing') {
      store.record(e)
      if (e.on && phase === 'playing') advance(e.note)
    }
  }
  function onPedal(e: LivePedalEvent): void {
    piano.sustain(e.down)
    if (active.value) store.record(e)
  }

  // A MIDI keyboard is heard only while it is the chosen input; the computer and on-screen keys always play.
  midi.onNote((e) => {
    if (store.inputDevice === 'midi') onNote(e)
  })
  midi.onPedal((e) => {
    if (store.inputDevice === 'midi') onPedal(e)
  })
  const computerKeys = useComputerKeys({ octave: toRef(store, 'keyMapOctave'), velocity: toRef(store, 'computerKeysVelocity') })
  computerKeys.onNote(onNote)

  function press(note: number, velocity: number, timeStampMs: number): void {
    onNote({ note, on: true, velocity, timeStampMs, source: 'screen' })
  }
  function release(note: number, timeStampMs: number): void {
    onNote({ note, on: false, velocity: 0, timeStampMs, source: 'screen' })
  }

  onMounted(() => {
    midi.enable().catch(() => { /* the status message says why */ })
  })

  /** The samples are loading: the start waits for them unless the piano is switched off. */
  const waitingForPiano = computed(() => store.soundOn && !piano.loaded.value && !piano.failed.value)

  async function start(): Promise<void> {
    const current = drill.value
    if (!current || active.value || waitingForPiano.value) return
    error.value = ''
    step = 0
    stepIndex.value = 0
    stepHits = new Set()
    clearFinish()
    store.begin({ drillId: current.id, drillVersion: current.version, assignmentId: assignmentId.value, inputDevice: store.inputDevice, deviceName: store.inputDevice === 'midi' ? midi.selected.value?.name : undefined })
    state.value = { phase: 'counting' }
    announcement.value = `Count-in: ${beatsPerBar.value} beats at ${store.tempoBpm} beats per minute.`
    try {
      const { zeroMs } = await metronome.start({
        bpm: store.tempoBpm,
        beatsPerBar: beatsPerBar.value,
        countInBars: 1,
        onBeat: (beat) => {
          if (beat.index === 0 && state.value.phase === 'counting') {
            state.value = { phase: 'playing' }
            announcement.value = 'Play now.'
          }
        },
      })
      store.setTimeZero(zeroMs)
    }
    catch (e) {
      state.value = { phase: 'ready' }
      store.cancel()
      error.value = e instanceof Error ? e.message : 'The metronome could not start'
      announcement.value = error.value
    }
  }

  async function finish(): Promise<void> {
    clearFinish()
    if (!active.value) return
    metronome.stop()
    const current = music.value
    if (!store.current || !current) {
      state.value = { phase: 'ready' }
      return
    }
    let attempt
    try {
      attempt = store.finish()
    }
    catch (e) {
      state.value = { phase: 'ready' }
      error.value = e instanceof Error ? e.message : 'The attempt could not be kept'
      return
    }
    // The grade shows at once from the engine here; the server grades the same events again and stores its own.
    const local = gradeAttempt(current, attempt.events, { targetBpm: ceilingBpm.value ?? undefined, handSize: store.handSize })
    state.value = { phase: 'done', result: local, save: { status: 'saving' }, tempoBpm: attempt.tempoBpm }
    announcement.value = `Finished. Score ${Math.round(local.score)} out of 100; saving.`
    const outcome = await outbox.save(attempt)
    if (state.value.phase !== 'done' || state.value.result !== local) return
    if (outcome.status === 'sent') {
      state.value = { ...state.value, result: outcome.attempt.result, save: { status: 'saved' } }
      announcement.value = `Saved. Score ${Math.round(outcome.attempt.result.score)} out of 100.`
      options.onSaved?.()
    }
    else {
      state.value = { ...state.value, save: { status: outcome.status === 'queued' ? 'waiting' : 'rejected', message: outcome.message } }
      announcement.value = `Score ${Math.round(local.score)} out of 100. ${outcome.message}`
    }
  }

  /** Stops without keeping the attempt (the student wants to start again). */
  function stop(): void {
    clearFinish()
    metronome.stop()
    store.cancel()
    state.value = { phase: 'ready' }
    announcement.value = 'Stopped; nothing was kept.'
  }

  onBeforeUnmount(() => {
    clearFinish()
    metronome.stop()
    piano.releaseAll()
  })

  /** The input the student chose: MIDI shows the device's name. */
  const inputDevice = computed<InputDevice>(() => store.inputDevice)

  return {
    state: readonly(state) as Readonly<Ref<PracticeState>>,
    active,
    result,
    announcement: readonly(announcement),
    error: readonly(error),
    stepIndex: readonly(stepIndex),
    steps,
    range,
    tightRange: narrowRange,
    plannedAt,
    pressed,
    targets,
    fingers,
    inferredKeys,
    shiftKeys,
    beat: metronome.beat,
    piano,
    midi,
    computerKeys,
    inputDevice,
    waitingForPiano,
    start,
    finish,
    stop,
    press,
    release,
  }
}

export type PracticeSession = ReturnType<typeof usePracticeSession>
