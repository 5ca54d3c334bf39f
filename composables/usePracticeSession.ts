// One practice session on one drill: the inputs wired to the piano and the recording, the count-in,
// the guide through the drill, grading and saving. The practice page keeps only the layout.
//   const session = usePracticeSession({ drill, assignmentId, ceilingBpm })
//   session.state – one typed state: ready → (listening →) counting → playing → done
//   session.last – the last pass's grade and its saving; a loop keeps it on screen while the next pass plays
//   session.start(), session.finish(), session.stop(), session.listen(); press/release for the on-screen keys
//   session.part (bars, hand), otherHand, loop, ladder: the practice tools; every pass is its own attempt
import { gradeAttempt, isBlackKey, midiFromName, type GradeResult } from '#shared/engine'
import type { AttemptPart, InputDevice } from '#shared/types/attempt'
import type { DrillMusic, DrillNote } from '#shared/types/drill'
import type { LiveNoteEvent, LivePedalEvent } from '#shared/types/live'
import { barCount, beatsPerBar as beatsPerBarOf, drillPart } from '#shared/utils/part'
import { DEFAULT_LADDER, ladderNextBpm, ladderStartBpm } from '#shared/utils/tempo'
import type { TempoLadder } from '#shared/utils/tempo'
import type { InjectionKey } from 'vue'
import type { SaveOutcome } from '~/composables/useAttemptOutbox'

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
  | { phase: 'listening' }
  | { phase: 'counting', pass: number, countIn: boolean }
  | { phase: 'playing', pass: number }
  | { phase: 'done' }

/** One graded pass: its grade (the server's once saved), how its saving went, and what it played. */
export interface PassResult {
  pass: number
  result: GradeResult
  save: SaveState
  tempoBpm: number
  /** The notes it was graded against (the part's, or the whole drill's). */
  notes: DrillNote[]
}

export interface LoopSettings {
  on: boolean
  /** A count-in bar before every pass; without it the next pass starts one beat after the last one ends. */
  countIn: boolean
}

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

/** Just the notes' span and a white key either side, for a narrow screen held upright. */
export function tightRange(notes: readonly number[]): { low: number, high: number } {
  const all = notes.length ? notes : [60]
  let low = Math.max(21, Math.min(...all) - 1)
  let high = Math.min(108, Math.max(...all) + 1)
  // A keyboard drawn from or to a black key would cut that key in half.
  while (low > 21 && isBlackKey(low)) low--
  while (high < 108 && isBlackKey(high)) high++
  return { low, high }
}

/** Notes that start together (a chord, or both hands) are one step to play, in order of their beat. */
export function stepsOf(notes: readonly DrillNote[]): number[][] {
  const byBeat = new Map<number, number[]>()
  notes.forEach((n, i) => byBeat.set(n.beat, [...(byBeat.get(n.beat) ?? []), i]))
  return [...byBeat.entries()].sort((a, b) => a[0] - b[0]).map(([, ix]) => ix)
}

/** Whether two grades say the same (the browser's and the server's, from the same events and engine). */
function sameGrade(a: GradeResult, b: GradeResult): boolean {
  return JSON.stringify(a) === JSON.stringify(b)
}

/** How far ahead the app's own notes are put on the audio clock, and how often it looks (as the metronome). */
const SCHEDULE_AHEAD_MS = 120
const SCHEDULE_TICK_MS = 25
/** A calm mezzo-forte for the notes the app plays. */
const APP_VELOCITY = 70
/** Time to settle before "listen first" begins. */
const LISTEN_LEAD_MS = 400

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
  const beatsPerBar = computed(() => beatsPerBarOf(drill.value?.meter))
  const bars = computed(() => barCount(drill.value?.notes ?? [], beatsPerBar.value))

  // The tools: which bars and hand to play, whether the app sounds the other hand, a loop, a ladder.
  const part = shallowRef<AttemptPart | null>(null)
  const otherHand = ref<'sounded' | 'silent'>('sounded')
  const loop = reactive<LoopSettings>({ on: false, countIn: true })
  const ladder = reactive<TempoLadder & { on: boolean }>({ on: false, ...DEFAULT_LADDER })
  watch(() => ladder.on, (on) => {
    if (on && ceilingBpm.value) store.tempoBpm = ladderStartBpm(ceilingBpm.value, ladder)
  })

  /** What is played and graded now: the chosen bars and hand, else the whole drill. */
  const played = computed(() => (music.value ? drillPart(music.value, part.value, beatsPerBar.value) : null))
  const notes = computed(() => played.value?.music.notes ?? [])
  const midiOf = computed(() => notes.value.map(n => midiFromName(n.pitch)))
  // Grading no performance at all yields the plan's own position changes, computed exactly as the grade will.
  const plannedAt = computed(() => (played.value ? gradeAttempt(played.value.music, []).positionChanges.plannedAt : []))
  const steps = computed(() => stepsOf(notes.value))
  // The keyboard spans the whole drill, so the keys stay put when a part is chosen.
  const allMidi = computed(() => (drill.value?.notes ?? []).map(n => midiFromName(n.pitch)))
  const range = computed(() => keyboardRange(allMidi.value))
  const narrowRange = computed(() => tightRange(allMidi.value))

  const state = shallowRef<PracticeState>({ phase: 'ready' })
  const active = computed(() => state.value.phase === 'counting' || state.value.phase === 'playing')
  const busy = computed(() => active.value || state.value.phase === 'listening')
  const last = shallowRef<PassResult | null>(null)
  const result = computed(() => (state.value.phase === 'done' ? last.value?.result ?? null : null))
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
    const shown = state.value.phase === 'done' ? notes.value.map((_, i) => i) : steps.value[stepIndex.value] ?? []
    return shown.flatMap(i => (notes.value[i]?.finger ? [{ midi: midiOf.value[i]!, finger: notes.value[i]!.finger! }] : []))
  })
  const inferredKeys = computed(() => (result.value?.inferredFingers ?? []).flatMap((f, i) => (f.finger ? [{ midi: midiOf.value[i]!, finger: f.finger }] : [])))
  const shiftKeys = computed(() => (result.value ? result.value.positionChanges.at.map(i => midiOf.value[i]!) : []))

  /**
   * Plays notes on the piano at their beats from `zeroMs`, a little ahead on the audio clock (like
   * the metronome), so a busy page cannot make them late; `light` also shows them on the keys and the
   * guide. Returns a function that cancels what is not yet scheduled.
   */
  function playNotes(list: readonly DrillNote[], zeroMs: number, beatMs: number, light: boolean): () => void {
    const timers = new Set<ReturnType<typeof setTimeout>>()
    const later = (atMs: number, fn: () => void): void => {
      const id = setTimeout(() => {
        timers.delete(id)
        fn()
      }, Math.max(0, atMs - performance.now()))
      timers.add(id)
    }
    const order = list.map((n, i) => ({ n, i, atMs: zeroMs + n.beat * beatMs })).sort((x, y) => x.atMs - y.atMs)
    const stepOf = new Map(steps.value.flatMap((ix, k) => ix.map(i => [i, k] as const)))
    let next = 0
    const tick = (): void => {
      while (next < order.length && order[next]!.atMs < performance.now() + SCHEDULE_AHEAD_MS) {
        const { n, i, atMs } = order[next++]!
        const midi = midiFromName(n.pitch)
        const lengthMs = n.length * beatMs * 0.95
        piano.playAt(midi, APP_VELOCITY, atMs, lengthMs)
        if (light) {
          later(atMs, () => {
            pressed.add(midi)
            stepIndex.value = stepOf.get(i) ?? stepIndex.value
          })
          later(atMs + lengthMs, () => pressed.delete(midi))
        }
      }
      if (next >= order.length) clearInterval(interval)
    }
    const interval = setInterval(tick, SCHEDULE_TICK_MS)
    tick()
    return () => {
      clearInterval(interval)
      timers.forEach(clearTimeout)
      if (light) pressed.clear()
    }
  }
  let cancelAppNotes: (() => void) | null = null
  function stopAppNotes(): void {
    cancelAppNotes?.()
    cancelAppNotes = null
  }

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
    playKey(piano, pressed, e)
    const phase = state.value.phase
    if (!closing && (phase === 'counting' || phase === 'playing')) {
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
  let pass = 0

  /** Starts a pass: with the count-in, or (a loop without it) one beat after the last pass ended. */
  async function start(options: { countIn?: boolean } = {}): Promise<void> {
    const current = drill.value
    if (!current || busy.value || waitingForPiano.value) return
    if (!played.value) {
      error.value = 'The chosen bars hold no notes for that hand.'
      return
    }
    const countIn = options.countIn ?? true
    error.value = ''
    step = 0
    stepIndex.value = 0
    stepHits = new Set()
    clearFinish()
    stopAppNotes()
    if (state.value.phase !== 'done' || !loop.on) pass = 0
    pass++
    store.begin({ drillId: current.id, drillVersion: current.version, assignmentId: assignmentId.value, inputDevice: store.inputDevice, deviceName: store.inputDevice === 'midi' ? midi.selected.value?.name : undefined })
    state.value = { phase: 'counting', pass, countIn }
    const beatMs = 60_000 / store.tempoBpm
    announcement.value = countIn ? `Count-in: ${beatsPerBar.value} beats at ${store.tempoBpm} beats per minute.` : `Pass ${pass} at ${store.tempoBpm} beats per minute.`
    try {
      const { zeroMs } = await metronome.start({
        bpm: store.tempoBpm,
        beatsPerBar: beatsPerBar.value,
        countInBars: countIn ? 1 : 0,
        startDelayS: countIn ? undefined : beatMs / 1000,
        onBeat: (beat) => {
          if (beat.index === 0 && state.value.phase === 'counting') {
            state.value = { phase: 'playing', pass }
            announcement.value = countIn ? 'Play now.' : ''
          }
        },
      })
      store.setTimeZero(zeroMs)
      const others = played.value?.others ?? []
      if (part.value?.hand && otherHand.value === 'sounded' && others.length) cancelAppNotes = playNotes(others, zeroMs, beatMs, false)
    }
    catch (e) {
      state.value = { phase: 'ready' }
      store.cancel()
      error.value = e instanceof Error ? e.message : 'The metronome could not start'
      announcement.value = error.value
    }
  }

  /** "Listen first": the app plays the part at the practice tempo, lighting keys and fingers as it goes. */
  function listen(): void {
    const current = played.value
    if (!current || busy.value || waitingForPiano.value) return
    error.value = ''
    stopAppNotes()
    const beatMs = 60_000 / store.tempoBpm
    const zeroMs = performance.now() + LISTEN_LEAD_MS
    const all = [...current.music.notes, ...(otherHand.value === 'sounded' ? current.others : [])]
    const endMs = Math.max(...all.map(n => (n.beat + n.length) * beatMs))
    state.value = { phase: 'listening' }
    announcement.value = `Listen: the drill at ${store.tempoBpm} beats per minute.`
    cancelAppNotes = playNotes(all, zeroMs, beatMs, true)
    finishTimer = setTimeout(() => {
      finishTimer = null
      stopAppNotes()
      stepIndex.value = 0
      state.value = { phase: 'ready' }
      announcement.value = 'Your turn.'
    }, LISTEN_LEAD_MS + endMs + 200)
  }

  // Set between a pass's end and its grade: the attempt is closed, and keys played meanwhile only sound.
  let closing = false

  async function finish(): Promise<void> {
    clearFinish()
    if (!active.value || closing) return
    metronome.stop()
    stopAppNotes()
    const current = played.value
    if (!store.current || !current) {
      state.value = { phase: 'ready' }
      return
    }
    let attempt
    try {
      attempt = { ...store.finish(), part: part.value }
    }
    catch (e) {
      state.value = { phase: 'ready' }
      error.value = e instanceof Error ? e.message : 'The attempt could not be kept'
      return
    }
    // Kept on this device before anything else (the request itself goes a task later). From here each step is a
    // task of its own, so a key played meanwhile (in a loop, the next pass) waits for one step at most, never for
    // the grading, the report and the request together.
    const saving = outbox.save(attempt).catch((e: unknown): SaveOutcome => ({ status: 'rejected', message: e instanceof Error ? e.message : 'The attempt could not be saved' }))
    closing = true
    await nextTask()
    // Stopped meanwhile: the pass had already ended, so it is saved, but nothing more is shown.
    if (!active.value) {
      closing = false
      await saving
      return
    }
    // The grade shows at once from the engine here; the server grades the same events again and stores its own.
    const local = gradeAttempt(current.music, attempt.events, { targetBpm: ceilingBpm.value ?? undefined, handSize: store.handSize })
    const mine: PassResult = { pass, result: local, save: { status: 'saving' }, tempoBpm: attempt.tempoBpm, notes: current.music.notes }
    const score = Math.round(local.score)
    let said = loop.on ? `Pass ${pass}: score ${score}.` : `Finished. Score ${score} out of 100.`
    if (ladder.on && ceilingBpm.value) {
      const next = ladderNextBpm(store.tempoBpm, local.score, ceilingBpm.value, ladder)
      if (next > store.tempoBpm) said += ` Tempo up to ${next}.`
      store.tempoBpm = next
    }
    announcement.value = said
    // Each pass of a loop is its own attempt: the next one starts a task later, and this one's report a task after.
    if (loop.on) {
      await nextTask()
      closing = false
      // Not stopped meanwhile: straight from this pass into the next, so "done" is never drawn in between.
      if (active.value) {
        state.value = { phase: 'done' }
        void start({ countIn: loop.countIn })
        // The pass's result is said before the next pass's count-in, in one announcement.
        announcement.value = `${said} ${announcement.value}`
      }
      await nextTask()
      last.value = mine
    }
    else {
      closing = false
      last.value = mine
      state.value = { phase: 'done' }
    }
    const outcome = await saving
    const save: SaveState = outcome.status === 'sent' ? { status: 'saved' } : { status: outcome.status === 'queued' ? 'waiting' : 'rejected', message: outcome.message }
    // The server's grade is nearly always the one on screen already: then only the saving's state changes there.
    const result = outcome.status === 'sent' && !sameGrade(outcome.attempt.result, local) ? outcome.attempt.result : local
    if (last.value === mine) last.value = { ...mine, save, result }
    if (outcome.status === 'sent') options.onSaved?.()
    else if (!loop.on) announcement.value = `${said} ${outcome.message}`
  }

  /** Stops without keeping the attempt (the student wants to start again). */
  function stop(): void {
    const listening = state.value.phase === 'listening'
    clearFinish()
    metronome.stop()
    stopAppNotes()
    store.cancel()
    state.value = { phase: 'ready' }
    announcement.value = listening ? 'Stopped.' : closing ? 'Stopped; the pass just played is saved.' : 'Stopped; this pass was not kept.'
  }

  onBeforeUnmount(() => {
    clearFinish()
    metronome.stop()
    stopAppNotes()
    piano.releaseAll()
  })

  /** The input the student chose: MIDI shows the device's name. */
  const inputDevice = computed<InputDevice>(() => store.inputDevice)

  return {
    state: readonly(state) as Readonly<Ref<PracticeState>>,
    active,
    busy,
    result,
    last: readonly(last) as Readonly<Ref<PassResult | null>>,
    notes,
    bars,
    part,
    otherHand,
    loop,
    ladder,
    listen,
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

const SESSION_KEY: InjectionKey<PracticeSession> = Symbol('practice-session')

/** The practice page hands its session to the controls and tools below it. */
export function providePracticeSession(session: PracticeSession): void {
  provide(SESSION_KEY, session)
}

export function injectPracticeSession(): PracticeSession {
  const session = inject(SESSION_KEY)
  if (!session) throw new Error('The practice controls need a practice session from the page around them')
  return session
}
