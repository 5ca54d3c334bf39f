// The sampled piano for live playing.
//   const piano = usePiano()
//   piano.noteOn(60, 90); piano.noteOff(60); piano.sustain(true); piano.releaseAll()
//   piano.loaded  – true once every sample is decoded (notes before that are silently dropped)
//   piano.progress – the share of samples decoded so far (0–1); piano.failed – they could not be loaded
//   piano.enabled – sound on/off, shared by every caller (the settings page toggles it)
// Samples come from public/samples/ (scripts/render-samples.sh: every third key A0–C8).
import type { Sampler } from 'tone'
import { Midi } from 'tonal'

const SAMPLE_LOW = 21
const SAMPLE_HIGH = 108
const SAMPLE_STEP = 3
/** A piano's dampers stop a string in a few tenths of a second, not instantly. */
const RELEASE_S = 0.4

let sampler: Sampler | null = null
let loading: Promise<void> | null = null
/** While the sustain pedal is down, released keys keep sounding until it comes up, as on a piano. */
let pedalDown = false
const sustained = new Set<number>()

/** tone's sampler keys are note names such as `D#1`; our files spell the sharp `s`. */
function sampleUrls(): Record<string, string> {
  const urls: Record<string, string> = {}
  for (let midi = SAMPLE_LOW; midi <= SAMPLE_HIGH; midi += SAMPLE_STEP) {
    const name = noteName(midi)
    urls[name] = `${name.replace('#', 's')}.ogg`
  }
  return urls
}

export function usePiano() {
  const enabled = useState('piano-enabled', () => true)
  const loaded = useState('piano-loaded', () => false)
  const progress = useState('piano-progress', () => 0)
  const failed = useState('piano-failed', () => false)
  const baseUrl = `${useRuntimeConfig().app.baseURL}samples/`

  /** Fetches and decodes each sample ourselves, so the page can show how far the loading is. */
  async function decodeSamples(): Promise<Record<string, AudioBuffer>> {
    const context = audioContext()
    if (!context) throw new Error('No audio context')
    const urls = Object.entries(sampleUrls())
    let done = 0
    const buffers = await Promise.all(urls.map(async ([note, file]) => {
      const response = await fetch(baseUrl + file)
      if (!response.ok) throw new Error(`Piano sample ${file}: ${response.status}`)
      const buffer = await context.decodeAudioData(await response.arrayBuffer())
      progress.value = ++done / urls.length
      return [note, buffer] as const
    }))
    return Object.fromEntries(buffers)
  }

  function load(): Promise<void> {
    loading ??= loadTone().then(async (Tone) => {
      const urls = await decodeSamples()
      // Decoded buffers are ready at once: the sampler has nothing left to load.
      sampler = new Tone.Sampler({ urls, release: RELEASE_S }).toDestination()
      loaded.value = true
    }).catch((error: unknown) => {
      failed.value = true
      loading = null
      throw error
    })
    return loading
  }

  function noteOn(midi: number, velocity = 80): void {
    // A note that arrives before the samples are ready is dropped: sounding it late would be worse.
    if (!enabled.value || !loaded.value || !sampler || !audioRunning()) return
    // A key struck again is held by its own key now, not by the pedal.
    sustained.delete(midi)
    sampler.triggerAttack(noteName(midi), undefined, Math.min(Math.max(velocity, 1), 127) / 127)
  }

  function noteOff(midi: number): void {
    if (!loaded.value || !sampler) return
    if (pedalDown) sustained.add(midi)
    else sampler.triggerRelease(noteName(midi))
  }

  /**
   * A note the app plays itself (listen first, the other hand), heard at `atMs` on the
   * performance.now() clock for `durationMs`; scheduled on the audio clock, so it is on time.
   */
  function playAt(midi: number, velocity: number, atMs: number, durationMs: number): void {
    if (!enabled.value || !loaded.value || !sampler || !audioRunning()) return
    const when = Math.max(audioNow(), performanceMsToAudioTime(atMs))
    sampler.triggerAttackRelease(noteName(midi), durationMs / 1000, when, Math.min(Math.max(velocity, 1), 127) / 127)
  }

  /** The sustain pedal (MIDI CC64): lifting it releases every key let go while it was down. */
  function sustain(down: boolean): void {
    pedalDown = down
    if (down || !loaded.value || !sampler) return
    for (const midi of sustained) sampler.triggerRelease(noteName(midi))
    sustained.clear()
  }

  /** Silences everything; the pedal counts as up until the keyboard next reports it. */
  function releaseAll(): void {
    pedalDown = false
    sustained.clear()
    if (loaded.value && sampler) sampler.releaseAll()
  }

  watch(enabled, (on) => {
    if (!on) releaseAll()
  })

  onMounted(() => {
    load().catch((error: unknown) => console.error('Piano samples failed to load', error))
  })

  return { enabled, loaded: readonly(loaded), progress: readonly(progress), failed: readonly(failed), noteOn, playAt, noteOff, sustain, releaseAll, load }
}

/** A key going down (lit in `pressed` and sounded on the piano) or up (let go). */
export function playKey(piano: Pick<ReturnType<typeof usePiano>, 'noteOn' | 'noteOff'>, pressed: Set<number>, e: { note: number, on: boolean, velocity: number }): void {
  if (e.on) {
    pressed.add(e.note)
    piano.noteOn(e.note, e.velocity)
  }
  else {
    pressed.delete(e.note)
    piano.noteOff(e.note)
  }
}

/** tone reads a bare number as a frequency in Hz, so notes go in by name (`C#4`). */
function noteName(midi: number): string {
  return Midi.midiToNoteName(midi, { sharps: true })
}
