// One low-latency audio context for the piano and the metronome, loaded on the client only.
// tone is imported dynamically so that server rendering never touches Web Audio.
import type { Gain, Sampler, Synth } from 'tone'

/** The parts of tone we play with. */
export interface Tone {
  Gain: typeof Gain
  Sampler: typeof Sampler
  Synth: typeof Synth
  start: () => Promise<void>
}

let loading: Promise<Tone> | null = null
let rawContext: AudioContext | null = null

/**
 * How often tone's own clock wakes the page. We schedule nothing on tone's transport, so the clock
 * only tidies up finished notes, and tone's default for `lookAhead: 0` (every 10 ms) would put a
 * hundred small tasks a second in the way of incoming notes.
 */
const UPDATE_INTERVAL_S = 0.1

/**
 * Loads tone once and gives it our own native AudioContext. We create the native context
 * ourselves (rather than letting tone wrap one) because only the native object offers
 * `getOutputTimestamp()`, which `audioTimeToPerformanceMs` needs. `lookAhead: 0` makes
 * `Tone.now()` the current audio time, so a live note is not delayed by tone's default 100 ms.
 */
export function loadTone(): Promise<Tone> {
  if (!import.meta.client) return Promise.reject(new Error('Audio is only available in the browser'))
  // tone's index module makes a default context the moment it is imported (a second audio stream,
  // clock and worker beside ours) and pulls in every instrument and effect, so the parts we play with
  // come from the files behind it. Destination.js gives each new context its loudspeaker.
  loading ??= Promise.all([
    import('tone/build/esm/core/Global.js'),
    import('tone/build/esm/core/context/Context.js'),
    import('tone/build/esm/core/context/Gain.js'),
    import('tone/build/esm/instrument/Sampler.js'),
    import('tone/build/esm/instrument/Synth.js'),
    import('tone/build/esm/core/context/Destination.js'),
  ]).then(([global, { Context }, { Gain }, { Sampler }, { Synth }]) => {
    rawContext = new AudioContext({ latencyHint: 'interactive' })
    global.setContext(new Context({ context: rawContext, lookAhead: 0, updateInterval: UPDATE_INTERVAL_S }))
    const Tone: Tone = { Gain, Sampler, Synth, start: global.start }
    resumeOnFirstGesture(Tone)
    return Tone
  })
  return loading
}

/** Browsers keep audio suspended until the user touches the page; MIDI notes do not count. */
function resumeOnFirstGesture(Tone: Tone): void {
  const events = ['pointerdown', 'keydown', 'touchend'] as const
  const resume = (): void => {
    void Tone.start().then(() => {
      if (rawContext?.state === 'running') events.forEach(e => window.removeEventListener(e, resume, true))
    })
  }
  events.forEach(e => window.addEventListener(e, resume, true))
}

/** The native audio context once tone is loaded (the piano decodes its samples with it). */
export function audioContext(): AudioContext | null {
  return rawContext
}

/** Whether audio is allowed to sound yet (false until the first user gesture). */
export function audioRunning(): boolean {
  return rawContext?.state === 'running'
}

/** The current audio-clock time in seconds (the clock that sounds are scheduled on). */
export function audioNow(): number {
  return rawContext?.currentTime ?? 0
}

/**
 * The `performance.now()` time (ms) at which a sound scheduled at audio time `t` (s) reaches
 * the speakers. The two clocks run from different origins and drift apart slowly, and the
 * output device adds its own latency, so we re-read the pairing on every call:
 * `getOutputTimestamp()` says that the sample rendered at `contextTime` is being heard at
 * `performanceTime`; a sound at `t` is heard `(t - contextTime)` seconds after that.
 * Where the browser lacks it (or the context is not yet running and reports zeros), we pair
 * `currentTime` with `performance.now()` and add the reported base and output latencies.
 */
export function audioTimeToPerformanceMs(t: number): number {
  const ctx = rawContext
  if (!ctx) return performance.now()
  const stamp = typeof ctx.getOutputTimestamp === 'function' ? ctx.getOutputTimestamp() : undefined
  if (stamp?.contextTime && stamp.performanceTime) {
    return stamp.performanceTime + (t - stamp.contextTime) * 1000
  }
  const latency = (ctx.baseLatency ?? 0) + (ctx.outputLatency ?? 0)
  return performance.now() + (t - ctx.currentTime + latency) * 1000
}

/** The audio-clock time (s) at which a sound is heard at `performance.now()` time `ms`: the inverse of the above. */
export function performanceMsToAudioTime(ms: number): number {
  const ctx = rawContext
  if (!ctx) return 0
  const stamp = typeof ctx.getOutputTimestamp === 'function' ? ctx.getOutputTimestamp() : undefined
  if (stamp?.contextTime && stamp.performanceTime) return stamp.contextTime + (ms - stamp.performanceTime) / 1000
  const latency = (ctx.baseLatency ?? 0) + (ctx.outputLatency ?? 0)
  return ctx.currentTime + (ms - performance.now()) / 1000 - latency
}
