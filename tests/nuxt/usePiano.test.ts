import { existsSync } from 'node:fs'
import { resolve } from 'node:path'
import { Note } from 'tonal'
import { describe, expect, it, vi } from 'vitest'
import { mockNuxtImport, mountSuspended } from '@nuxt/test-utils/runtime'

// happy-dom has no Web Audio: a stand-in context keeps every voice the piano makes. The sample files
// are served (once the test says so) as their own names, and a decoded "buffer" is that name, so a
// voice tells which sample it plays.
const fake = vi.hoisted(() => {
  class Param {
    value = 1
    target: number | null = null
    setTargetAtTime(value: number): void { this.target = value }
  }
  class Node {
    connect<T>(next: T): T { return next }
    disconnect(): void {}
  }
  class Source extends Node {
    buffer: { file: string } | null = null
    playbackRate = new Param()
    onended: (() => void) | null = null
    started = false
    stopAt: number | null = null
    start(): void { this.started = true }
    stop(at: number): void { this.stopAt = at }
  }
  class Gain extends Node {
    gain = new Param()
  }
  const voices: { source: Source, gain: Gain }[] = []
  // The piano makes each voice's source, then its gain.
  const context = {
    currentTime: 10,
    destination: new Node(),
    decodeAudioData: async (bytes: ArrayBuffer) => ({ file: new TextDecoder().decode(bytes) }),
    createBufferSource(): Source {
      const source = new Source()
      voices.push({ source, gain: new Gain() })
      return source
    },
    createGain: (): Gain => voices.at(-1)!.gain,
  }
  const requested: string[] = []
  let open: () => void = () => {}
  const samplesServed = new Promise<void>((resolve) => {
    open = resolve
  })
  return { context, voices, requested, samplesServed, serveSamples: () => open() }
})

mockNuxtImport('audioContext', () => () => fake.context)
mockNuxtImport('audioRunning', () => () => true)

const realFetch = globalThis.fetch
vi.stubGlobal('fetch', async (input: RequestInfo | URL, init?: RequestInit): Promise<Response> => {
  const url = String(input)
  if (!url.includes('/samples/')) return realFetch(input, init)
  fake.requested.push(url)
  await fake.samplesServed
  return new Response(url.slice(url.lastIndexOf('/') + 1))
})

/** The key a voice sounds: its sample's note moved by its playback rate, in semitones. */
function keyOf(voice: (typeof fake.voices)[number]): number {
  const sample = Note.midi(voice.source.buffer!.file.replace('.ogg', '').replace('s', '#'))!
  return sample + Math.round(12 * Math.log2(voice.source.playbackRate.value))
}
const released = (): number[] => fake.voices.filter(v => v.source.stopAt !== null).map(keyOf)

async function mountPiano(): Promise<ReturnType<typeof usePiano>> {
  let piano: ReturnType<typeof usePiano> | undefined
  await mountSuspended(defineComponent({
    setup() {
      piano = usePiano()
      return () => h('div')
    },
  }))
  return piano!
}

describe('usePiano', () => {
  it('asks for every sample the render script makes, and each file exists', async () => {
    await mountPiano()
    await vi.waitFor(() => expect(fake.requested).toHaveLength(30))
    const files = fake.requested.map(url => url.slice(url.lastIndexOf('/') + 1))
    expect(fake.requested.every(url => url.endsWith(`/samples/${url.slice(url.lastIndexOf('/') + 1)}`))).toBe(true)
    expect(files).toContain('A0.ogg')
    expect(files).toContain('Ds1.ogg')
    expect(files).toContain('C8.ogg')
    for (const file of files) {
      // vitest runs from the project root.
      expect(existsSync(resolve('public/samples', file)), file).toBe(true)
    }
  })

  it('drops notes that arrive before the samples load, then plays each key from the nearest sample with velocity scaled to 0–1', async () => {
    const piano = await mountPiano()
    expect(() => piano.noteOn(60, 100)).not.toThrow()
    expect(() => piano.noteOff(60)).not.toThrow()
    expect(fake.voices).toHaveLength(0)
    expect(piano.loaded.value).toBe(false)

    fake.serveSamples()
    await vi.waitFor(() => expect(piano.loaded.value).toBe(true))
    piano.noteOn(61, 127)
    piano.noteOn(60, 0)
    piano.noteOff(61)
    expect(fake.voices.map(v => ({ file: v.source.buffer!.file, key: keyOf(v), gain: v.gain.gain.value, started: v.source.started })))
      .toEqual([{ file: 'C4.ogg', key: 61, gain: 1, started: true }, { file: 'C4.ogg', key: 60, gain: 1 / 127, started: true }])
    expect(released()).toEqual([61])
    // The damper: the level falls away and the source stops a release time later.
    expect(fake.voices[0]!.gain.gain.target).toBe(0)
    expect(fake.voices[0]!.source.stopAt).toBeCloseTo(fake.context.currentTime + 0.4, 6)

    piano.enabled.value = false
    piano.noteOn(62, 90)
    await nextTick()
    expect(fake.voices).toHaveLength(2)
    expect(released()).toEqual([61, 60])
  })

  it('holds released keys while the sustain pedal is down and lets them go when it comes up', async () => {
    const piano = await mountPiano()
    piano.enabled.value = true
    fake.voices.length = 0
    piano.noteOn(60, 80)
    piano.noteOn(64, 80)
    piano.sustain(true)
    piano.noteOff(60)
    piano.noteOff(64)
    expect(released()).toEqual([])
    // Struck again under the pedal, E is held by its key when the pedal lifts.
    piano.noteOn(64, 80)
    piano.sustain(false)
    expect(released()).toEqual([60])
    piano.noteOff(64)
    expect(released()).toEqual([60, 64, 64])
  })
})
