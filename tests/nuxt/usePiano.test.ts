import { existsSync } from 'node:fs'
import { resolve } from 'node:path'
import { describe, expect, it, vi } from 'vitest'
import { mockNuxtImport, mountSuspended } from '@nuxt/test-utils/runtime'

const fake = vi.hoisted(() => {
  const state = {
    options: null as null | { urls: Record<string, string>, baseUrl: string, onload: () => void },
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
    await vi.waitFor(() => expect(fake.state.options).not.toBeNull())
    const { urls, baseUrl } = fake.state.options!
    expect(baseUrl).toMatch(/\/samples\/$/)
    expect(Object.keys(urls)).toHaveLength(30)
    expect(urls['A0']).toBe('A0.ogg')
    expect(urls['D#1']).toBe('Ds1.ogg')
    expect(urls['C8']).toBe('C8.ogg')
    for (const file of Object.values(urls)) {
      // vitest runs from the project root.
      expect(existsSync(resolve('public/samples', file)), file).toBe(true)
    }
  })

  it('drops notes that arrive before the samples load, then plays by name with velocity scaled to 0–1', async () => {
    const piano = await mountPiano()
    expect(() => piano.noteOn(60, 100)).not.toThrow()
    expect(() => piano.noteOff(60)).not.toThrow()
    expect(fake.state.attacks).toHaveLength(0)
    expect(piano.loaded.value).toBe(false)

    fake.state.options!.onload()
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
    fake.state.options!.onload()
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
