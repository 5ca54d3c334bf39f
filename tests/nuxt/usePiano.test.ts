import { existsSync } from 'node:fs'
import { resolve } from 'node:path'
import { describe, expect, it, vi } from 'vitest'
import { mockNuxtImport, mountSuspended } from '@nuxt/test-utils/runtime'

const fake = vi.hoisted(() => {
  const state = {
    options: null as null | { urls: Record<string, { file: string }> },
    fetched: [] as string[],
    loadSamples: null as null | (() => void),
    attacks: [] as { note: string, velocity: number }[],
    releases: [] as string[],
  }
  class Sampler {
    constructor(options: NonNullable<typeof state.options>) { state.options = options }
    toDestination(): this { return this }
    triggerAttack(note: string, _time: undefined, velocity: number): void { state.attacks.push({ note, velocity }) }
    triggerRelease(note: string): void { state.releases.push(note) }
    releaseAll(): void { state.releases.push('all') }
  }
  return { state, tone: { Sampler } }
})

mockNuxtImport('loadTone', () => () => Promise.resolve(fake.tone))
mockNuxtImport('audioRunning', () => () => true)
// The sample files are read from public/ as the server would send them; each decodes to its name.
mockNuxtImport('audioContext', () => () => ({ decodeAudioData: async (bytes: ArrayBuffer) => ({ file: new TextDecoder().decode(bytes) }) }))
vi.stubGlobal('fetch', async (url: string) => {
  fake.state.fetched.push(url)
  const file = url.split('/').pop()!
  // Held until the test lets the samples arrive, so it can see a note played before they did.
  await new Promise<void>((done) => {
    const previous = fake.state.loadSamples
    fake.state.loadSamples = () => {
      previous?.()
      done()
    }
  })
  return existsSync(resolve('public/samples', file))
    ? { ok: true, status: 200, arrayBuffer: async () => new TextEncoder().encode(file).buffer }
    : { ok: false, status: 404 }
})

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
  it('loads every sample the render script makes, counting them as they arrive', async () => {
    const piano = await mountPiano()
    await vi.waitFor(() => expect(fake.state.fetched).toHaveLength(30))
    expect(piano.progress.value).toBe(0)
    // A note before the samples is dropped: sounding it late would be worse.
    expect(() => piano.noteOn(60, 100)).not.toThrow()
    expect(() => piano.noteOff(60)).not.toThrow()
    expect(fake.state.attacks).toHaveLength(0)
    for (const url of fake.state.fetched) expect(url).toMatch(/\/samples\/[A-G]s?\d\.ogg$/)
    fake.state.loadSamples!()
    await vi.waitFor(() => expect(piano.loaded.value).toBe(true))
    expect(piano.progress.value).toBe(1)
    expect(piano.failed.value).toBe(false)
    const { urls } = fake.state.options!
    // vitest runs from the project root; a missing file would have failed the loading.
    expect(Object.keys(urls)).toHaveLength(30)
    expect(urls['A0']).toEqual({ file: 'A0.ogg' })
    expect(urls['D#1']).toEqual({ file: 'Ds1.ogg' })
    expect(urls['C8']).toEqual({ file: 'C8.ogg' })
  })

  it('plays by name with velocity scaled to 0–1 once loaded, and stops when switched off', async () => {
    const piano = await mountPiano()
    expect(piano.loaded.value).toBe(true)
    piano.noteOn(61, 127)
    piano.noteOn(60, 0)
    piano.noteOff(61)
    expect(fake.state.attacks).toEqual([{ note: 'C#4', velocity: 1 }, { note: 'C4', velocity: 1 / 127 }])
    expect(fake.state.releases).toEqual(['C#4'])

    piano.enabled.value = false
    piano.noteOn(62, 90)
    await nextTick()
    expect(fake.state.attacks).toHaveLength(2)
    expect(fake.state.releases).toContain('all')
  })

  it('holds released keys while the sustain pedal is down and lets them go when it comes up', async () => {
    const piano = await mountPiano()
    piano.enabled.value = true
    fake.state.releases.length = 0
    piano.noteOn(60, 80)
    piano.noteOn(64, 80)
    piano.sustain(true)
    piano.noteOff(60)
    piano.noteOff(64)
    expect(fake.state.releases).toEqual([])
    // Struck again under the pedal, E is held by its key when the pedal lifts.
    piano.noteOn(64, 80)
    piano.sustain(false)
    expect(fake.state.releases).toEqual(['C4'])
    piano.noteOff(64)
    expect(fake.state.releases).toEqual(['C4', 'E4'])
  })
})
