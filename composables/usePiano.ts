// The sampled piano for live playing.
//   const piano = usePiano()
//   piano.noteOn(60, 90); piano.noteOff(60); piano.sustain(true); piano.releaseAll()
//   piano.loaded  – true once every sample is decoded (notes before that are silently dropped)
//   piano.enabled – sound on/off, shared by every caller (the settings page toggles it)
// Samples come from public/samples/ (scripts/render-samples.sh: every third key A0–C8).
// A note is one native buffer source and gain on the shared context: tone's Sampler built a dozen
// wrapper objects for each note, half a millisecond or more of the note-on's task in chromium, the
// task whose end lets the frame that lights the key begin.
import { Midi } from 'tonal'

const SAMPLE_LOW = 21
const SAMPLE_HIGH = 108
const SAMPLE_STEP = 3
/** A piano's dampers stop a string in a few tenths of a second, not instantly. */
const RELEASE_S = 0.4
/** Five time constants over the release: the level is down 43 dB when the source stops. */
const RELEASE_TIME_CONSTANT_S = RELEASE_S / 5

interface Voice {
  source: AudioBufferSourceNode
  gain: GainNode
}

let samples: Map<number, AudioBuffer> | null = null
let loading: Promise<void> | null = null
/** What each key is sounding: a key struck again before its last note faded sounds twice, as a string would. */
const voices = new Map<number, Voice[]>()
/** While the sustain pedal is down, released keys keep sounding until it comes up, as on a piano. */
let pedalDown = false
const sustained = new Set<number>()

/** The files' names: note names with the sharp spelt `s` (`Ds1.ogg`). */
function sampleFiles(): Map<number, string> {
  const files = new Map<number, string>()
  for (let midi = SAMPLE_LOW; midi <= SAMPLE_HIGH; midi += SAMPLE_STEP) {
    files.set(midi, `${Midi.midiToNoteName(midi, { sharps: true }).replace('#', 's')}.ogg`)
  }
  return files
}

/** The recorded key nearest to `midi`, at most a semitone away. */
function nearestSample(midi: number): number {
  const step = Math.round((midi - SAMPLE_LOW) / SAMPLE_STEP)
  return Math.min(Math.max(SAMPLE_LOW + step * SAMPLE_STEP, SAMPLE_LOW), SAMPLE_HIGH)
}

/** A voice that has stopped, released or at the end of its sample, leaves its key's list. */
function forget(midi: number, voice: Voice): void {
  const sounding = voices.get(midi) ?? []
  const at = sounding.indexOf(voice)
  if (at >= 0) sounding.splice(at, 1)
  if (!sounding.length) voices.delete(midi)
}

function releaseKey(midi: number): void {
  const sounding = voices.get(midi)
  if (!sounding) return
  voices.delete(midi)
  const now = audioContext().currentTime
  for (const { source, gain } of sounding) {
    gain.gain.setTargetAtTime(0, now, RELEASE_TIME_CONSTANT_S)
    source.stop(now + RELEASE_S)
  }
}

export function usePiano() {
  const enabled = useState('piano-enabled', () => true)
  const loaded = useState('piano-loaded', () => false)
  const baseUrl = `${useRuntimeConfig().app.baseURL}samples/`

  function load(): Promise<void> {
    loading ??= (async () => {
      const context = audioContext()
      const decoded = await Promise.all([...sampleFiles()].map(async ([midi, file]) => {
        const res = await fetch(baseUrl + file)
        if (!res.ok) throw new Error(`Piano sample ${file}: HTTP ${res.status}`)
        return [midi, await context.decodeAudioData(await res.arrayBuffer())] as const
      }))
      samples = new Map(decoded)
      loaded.value = true
    })()
    return loading
  }

  function noteOn(midi: number, velocity = 80): void {
    // A note that arrives before the samples are ready is dropped: sounding it late would be worse.
    if (!enabled.value || !loaded.value || !samples || !audioRunning()) return
    const context = audioContext()
    // A key struck again is held by its own key now, not by the pedal.
    sustained.delete(midi)
    const sample = nearestSample(midi)
    const source = context.createBufferSource()
    source.buffer = samples.get(sample)!
    source.playbackRate.value = 2 ** ((midi - sample) / 12)
    const gain = context.createGain()
    gain.gain.value = Math.min(Math.max(velocity, 1), 127) / 127
    source.connect(gain).connect(context.destination)
    const voice = { source, gain }
    source.onended = () => {
      gain.disconnect()
      forget(midi, voice)
    }
    source.start()
    voices.set(midi, [...(voices.get(midi) ?? []), voice])
  }

  function noteOff(midi: number): void {
    if (pedalDown) sustained.add(midi)
    else releaseKey(midi)
  }

  /** The sustain pedal (MIDI CC64): lifting it releases every key let go while it was down. */
  function sustain(down: boolean): void {
    pedalDown = down
    if (down) return
    sustained.forEach(releaseKey)
    sustained.clear()
  }

  /** Silences everything; the pedal counts as up until the keyboard next reports it. */
  function releaseAll(): void {
    pedalDown = false
    sustained.clear()
    for (const midi of voices.keys()) releaseKey(midi)
  }

  watch(enabled, (on) => {
    if (!on) releaseAll()
  })

  onMounted(() => {
    load().catch((error: unknown) => console.error('Piano samples failed to load', error))
  })

  return { enabled, loaded: readonly(loaded), noteOn, noteOff, sustain, releaseAll, load }
}
