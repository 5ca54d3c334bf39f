// The metronome: an accented downbeat, a count-in, its own volume and mute.
//   const metronome = useMetronome()
//   const { zeroMs } = await metronome.start({ bpm: 80, beatsPerBar: 4, countInBars: 1, onBeat })
//   onBeat({ index, isDownbeat, isCountIn, timeMs }) fires as each beat is heard; index 0 is the
//   first beat after the count-in (count-in beats are negative), timeMs is its performance.now() time.
//   zeroMs: the performance.now() time (ms) of beat 0, the attempt's time zero.
//   metronome.beat – the beat last heard (null when stopped), for whatever shows the beat: a
//   component reading it re-renders on each beat without its parent doing so
//   metronome.volume (0–1), metronome.muted, metronome.running, metronome.stop()
// It plays exactly the tempo it is given: it never raises it (safety: the teacher's target is a ceiling).
import type { Gain, Synth } from 'tone'

export interface MetronomeBeat {
  index: number
  isDownbeat: boolean
  isCountIn: boolean
  timeMs: number
}

export interface MetronomeStart {
  bpm: number
  beatsPerBar: number
  countInBars?: number
  /** Seconds from now to the first click (default 0.1: just time to schedule it). */
  startDelayS?: number
  onBeat?: (beat: MetronomeBeat) => void
}

/** Clicks are scheduled on the audio clock this far ahead, so a busy main thread cannot make them late. */
const SCHEDULE_AHEAD_S = 0.12
const TICK_MS = 25
/** Time to get the first click scheduled after `start()`. */
const START_DELAY_S = 0.1
const ACCENT_HZ = 1568 // G6: high enough to cut through piano sound
const BEAT_HZ = 1047 // C6
const CLICK_S = 0.03

export interface MetronomeOptions {
  /** 0–1; shared with the settings when given (the practice store's `metronomeVolume`). */
  volume?: Ref<number>
  muted?: Ref<boolean>
}

export function useMetronome(options: MetronomeOptions = {}) {
  const volume = options.volume ?? ref(0.7)
  const muted = options.muted ?? ref(false)
  const running = ref(false)
  const beat = shallowRef<MetronomeBeat | null>(null)

  let output: Gain | null = null
  let synth: Synth | null = null
  let timer: ReturnType<typeof setInterval> | null = null
  const pending = new Set<ReturnType<typeof setTimeout>>()
  /** Bumped by every stop, so a start still loading audio knows it was cancelled meanwhile. */
  let generation = 0

  const level = (): number => (muted.value ? 0 : Math.min(Math.max(volume.value, 0), 1))
  watch([volume, muted], () => {
    output?.gain.rampTo(level(), 0.02)
  })

  async function start(options: MetronomeStart): Promise<{ zeroMs: number }> {
    const { bpm, beatsPerBar, countInBars = 1, startDelayS = START_DELAY_S, onBeat } = options
    if (!(bpm > 0 && Number.isFinite(bpm))) throw new RangeError(`Tempo must be a positive number of beats per minute, got ${bpm}`)
    if (!(Number.isInteger(beatsPerBar) && beatsPerBar > 0)) throw new RangeError(`Beats per bar must be a positive whole number, got ${beatsPerBar}`)
    if (!(Number.isInteger(countInBars) && countInBars >= 0)) throw new RangeError(`Count-in bars must be a whole number, got ${countInBars}`)
    stop()
    const mine = generation

    const Tone = await loadTone()
    await Tone.start()
    if (mine !== generation) throw new DOMException('The metronome was stopped while starting', 'AbortError')
    output ??= new Tone.Gain(level()).toDestination()
    synth = new Tone.Synth({
      oscillator: { type: 'triangle' },
      envelope: { attack: 0.001, decay: CLICK_S, sustain: 0, release: 0.01 },
    }).connect(output)

    const secondsPerBeat = 60 / bpm
    const firstBeat = -countInBars * beatsPerBar
    const startTime = audioNow() + Math.max(START_DELAY_S, startDelayS)
    const beatTime = (index: number): number => startTime + (index - firstBeat) * secondsPerBeat
    const zeroMs = audioTimeToPerformanceMs(beatTime(0))

    let next = firstBeat
    const schedule = (): void => {
      while (synth && beatTime(next) < audioNow() + SCHEDULE_AHEAD_S) {
        const index = next
        const time = beatTime(index)
        const isDownbeat = ((index % beatsPerBar) + beatsPerBar) % beatsPerBar === 0
        synth.triggerAttackRelease(isDownbeat ? ACCENT_HZ : BEAT_HZ, CLICK_S, time, isDownbeat ? 1 : 0.55)
        const timeMs = audioTimeToPerformanceMs(time)
        const id = setTimeout(() => {
          pending.delete(id)
          beat.value = { index, isDownbeat, isCountIn: index < 0, timeMs }
          onBeat?.(beat.value)
        }, Math.max(0, timeMs - performance.now()))
        pending.add(id)
        next++
      }
    }
    schedule()
    timer = setInterval(schedule, TICK_MS)
    running.value = true
    return { zeroMs }
  }

  function stop(): void {
    generation++
    if (timer) clearInterval(timer)
    timer = null
    pending.forEach(id => clearTimeout(id))
    pending.clear()
    // Disposing the synth also silences the clicks already scheduled on the audio clock.
    synth?.dispose()
    synth = null
    running.value = false
    beat.value = null
  }

  if (getCurrentScope()) {
    onScopeDispose(() => {
      stop()
      output?.dispose()
      output = null
    })
  }

  return { volume, muted, running: readonly(running), beat: readonly(beat), start, stop }
}
