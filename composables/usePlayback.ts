// Plays a list of timed notes back: each key lights on the keyboard and sounds on the piano at
// its time, divided by the speed (0.5 = half speed).
//   const playback = usePlayback(); playback.play(notes, 0.5); playback.stop()
//   playback.pressed – the keys down now (a reactive Set, as KeyboardView takes it)
//   playback.startedAt – performance.now() at time zero of the running playback, for tests
// One timer waits for the next due event, so a key lights within a few ms of its time.
import { midiFromName, type DrillNote } from '#shared/engine'

export interface TimedNote {
  midi: number
  onMs: number
  offMs: number
  velocity: number
}

interface Step { at: number, midi: number, on: boolean, velocity: number }

/** A velocity for drill notes: mezzo-forte, like the engine's MIDI export of a drill. */
const DRILL_VELOCITY = 80

/** A drill's notes as they sound at its tempo, from its first beat. */
export function drillTimedNotes(notes: readonly DrillNote[], tempoBpm: number): TimedNote[] {
  const msPerBeat = 60_000 / tempoBpm
  return notes.map(n => ({ midi: midiFromName(n.pitch), onMs: n.beat * msPerBeat, offMs: (n.beat + n.length) * msPerBeat, velocity: DRILL_VELOCITY }))
}

export function usePlayback() {
  const piano = usePiano()
  const pressed = reactive(new Set<number>())
  const playing = ref(false)
  const startedAt = ref<number | null>(null)
  let timer: ReturnType<typeof setTimeout> | null = null

  function stop(): void {
    if (timer) clearTimeout(timer)
    timer = null
    for (const midi of pressed) piano.noteOff(midi)
    pressed.clear()
    playing.value = false
  }

  async function play(notes: readonly TimedNote[], speed = 1): Promise<void> {
    stop()
    await piano.load().catch(() => undefined)
    const origin = Math.min(0, ...notes.map(n => n.onMs))
    const steps: Step[] = notes.flatMap(n => [
      { at: (n.onMs - origin) / speed, midi: n.midi, on: true, velocity: n.velocity },
      { at: (Math.max(n.offMs, n.onMs + 1) - origin) / speed, midi: n.midi, on: false, velocity: 0 },
    ])
    // At one instant a release goes first, so a key struck again re-lights.
    steps.sort((a, b) => a.at - b.at || Number(a.on) - Number(b.on))
    let next = 0
    const zero = performance.now()
    startedAt.value = zero
    playing.value = true
    const run = (): void => {
      const now = performance.now() - zero
      while (next < steps.length && steps[next]!.at <= now + 1) {
        const s = steps[next++]!
        playKey(piano, pressed, { note: s.midi, on: s.on, velocity: s.velocity })
      }
      if (next >= steps.length) {
        playing.value = false
        timer = null
        return
      }
      timer = setTimeout(run, Math.max(0, steps[next]!.at - (performance.now() - zero)))
    }
    run()
  }

  onBeforeUnmount(stop)
  return { pressed, playing, startedAt, play, stop }
}
