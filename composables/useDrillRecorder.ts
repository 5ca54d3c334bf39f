// Records a drill played in the editor, on the same inputs the practice page listens to: the MIDI
// keyboard while it is the chosen input (useMidiInput), the computer keys (useComputerKeys) and the
// on-screen keys (press/release). Every key sounds on the piano as it is played.
//   const recorder = useDrillRecorder({ active })   active: listen to the inputs only while true
//   recorder.start(), recorder.stop() – after stop, recorder.notes holds the paired notes in onset order
//   recorder.pressed – the keys down now, for a KeyboardView
import type { LiveNoteEvent } from '#shared/types/live'
import { recordedNotes, type RecordedKey, type RecordedNote } from '#shared/utils/recording'

export function useDrillRecorder(options: { active: MaybeRefOrGetter<boolean> }) {
  const store = usePracticeStore()
  const piano = usePiano()
  const midi = useMidiInput()
  const pressed = reactive(new Set<number>())
  const recording = ref(false)
  const notes = shallowRef<RecordedNote[]>([])
  /** The keys of the recording under way: a plain list that nothing renders. */
  let keys: RecordedKey[] = []

  function onNote(e: LiveNoteEvent): void {
    if (!toValue(options.active)) return
    playKey(piano, pressed, e)
    if (recording.value) keys.push({ note: e.note, on: e.on, timeStampMs: e.timeStampMs })
  }

  midi.onNote((e) => {
    if (store.inputDevice === 'midi') onNote(e)
  })
  midi.onPedal((e) => {
    if (store.inputDevice === 'midi' && toValue(options.active)) piano.sustain(e.down)
  })
  const computerKeys = useComputerKeys({ octave: toRef(store, 'keyMapOctave'), velocity: toRef(store, 'computerKeysVelocity'), enabled: options.active })
  computerKeys.onNote(onNote)

  // MIDI access may prompt, so it is asked for only once the teacher opens the recorder.
  watch(() => toValue(options.active), (on) => {
    if (on) midi.enable().catch(() => { /* the status message says why */ })
  }, { immediate: true })

  function start(): void {
    keys = []
    notes.value = []
    recording.value = true
  }

  function stop(): void {
    const endMs = performance.now()
    computerKeys.releaseAll(endMs)
    recording.value = false
    notes.value = recordedNotes(keys, endMs)
  }

  function press(note: number, velocity: number, timeStampMs: number): void {
    onNote({ note, on: true, velocity, timeStampMs, source: 'screen' })
  }
  function release(note: number, timeStampMs: number): void {
    onNote({ note, on: false, velocity: 0, timeStampMs, source: 'screen' })
  }

  return { pressed, recording: readonly(recording), notes, start, stop, press, release }
}
