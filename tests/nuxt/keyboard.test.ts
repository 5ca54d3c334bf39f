import { describe, expect, it, vi } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import type { DOMWrapper } from '@vue/test-utils'
import { KeyboardView } from '#components'

type Mounted = Awaited<ReturnType<typeof mountSuspended>>

const keys = (w: Mounted): DOMWrapper<Element>[] => w.findAll('[data-midi]')
const key = (w: Mounted, midi: number): DOMWrapper<Element> => w.get(`[data-midi="${midi}"]`)
const presses = (w: Mounted) => (w.emitted('press') ?? []) as [midi: number, velocity: number, timeStampMs: number][]
const releases = (w: Mounted) => (w.emitted('release') ?? []) as [midi: number, timeStampMs: number][]
const percent = (value: string | undefined): number => Number.parseFloat(value ?? 'NaN')
const leftOf = (w: Mounted, midi: number) => percent((key(w, midi).element as HTMLElement).style.left)
const rightOf = (w: Mounted, midi: number) => {
  const style = (key(w, midi).element as HTMLElement).style
  return percent(style.left) + percent(style.width)
}

/** Gives a key a real-looking box (happy-dom lays nothing out), 100 px tall from y = 0. */
function giveBox(w: Mounted, midi: number): void {
  const el = key(w, midi).element as HTMLElement
  vi.spyOn(el, 'getBoundingClientRect').mockReturnValue({
    x: 0, y: 0, top: 0, left: 0, bottom: 100, right: 20, width: 20, height: 100, toJSON: () => ({}),
  } as DOMRect)
}

describe('KeyboardView', () => {
  it.each([
    // A0–C8, the 88-key piano: 52 white, 36 black.
    [21, 108, 52, 36],
    // C4–C5: one octave and its top C.
    [60, 72, 8, 5],
    // Starting and ending on black keys: C♯4–A♯4.
    [61, 70, 5, 5],
  ])('draws MIDI %i–%i with %i white and %i black keys', async (low, high, white, black) => {
    const w = await mountSuspended(KeyboardView, { props: { low, high } })
    expect(keys(w)).toHaveLength(high - low + 1)
    expect(w.findAll('.key-white')).toHaveLength(white)
    expect(w.findAll('.key-black')).toHaveLength(black)
  })

  it('places each black key over the gap between its white neighbours, and keeps white keys side by side', async () => {
    const w = await mountSuspended(KeyboardView, { props: { low: 21, high: 108 } })
    for (let midi = 22; midi < 108; midi++) {
      if (![1, 3, 6, 8, 10].includes(midi % 12)) continue
      const gap = rightOf(w, midi - 1)
      expect(leftOf(w, midi)).toBeLessThan(gap)
      expect(rightOf(w, midi)).toBeGreaterThan(gap)
      expect(leftOf(w, midi + 1)).toBeCloseTo(gap, 6)
    }
    expect(leftOf(w, 21)).toBeCloseTo(0, 6)
    expect(rightOf(w, 108)).toBeCloseTo(100, 6)
  })

  it('keeps real proportions: white keys 23.5 mm, black keys 13.7 mm wide and 60 % as long', async () => {
    const w = await mountSuspended(KeyboardView, { props: { low: 21, high: 108 } })
    const width = (midi: number) => percent((key(w, midi).element as HTMLElement).style.width)
    expect(width(60)).toBeCloseTo(100 / 52, 6)
    expect(width(61) / width(60)).toBeCloseTo(13.7 / 23.5, 6)
    expect(percent((key(w, 61).element as HTMLElement).style.height)).toBeCloseTo(60, 6)
    // happy-dom drops the CSS aspect-ratio property, so the height-to-width figure is read from the layout.
    expect(layoutKeyboard(21, 108).aspectRatio).toBeCloseTo((52 * 23.5) / 150, 6)
  })

  it('shows planned fingers and, after an attempt, the played finger beside them as numbers', async () => {
    const w = await mountSuspended(KeyboardView, {
      props: { low: 60, high: 72, fingers: { 60: 1, 62: 2 }, inferred: [{ midi: 62, finger: 3 }] },
    })
    expect(key(w, 60).text()).toContain('1')
    expect(key(w, 60).find('.sr-only').text()).toBe('C 4, finger 1')
    expect(key(w, 62).findAll('.finger-badge').map(b => b.text())).toEqual(['2', '3'])
    expect(key(w, 62).find('.sr-only').text()).toBe('D 4, finger 2, played with 3')
    expect(key(w, 64).findAll('.finger-badge')).toHaveLength(0)
  })

  it('marks the next key and position changes in words and shapes, not colour alone', async () => {
    const w = await mountSuspended(KeyboardView, { props: { low: 60, high: 72, targets: [65], positionChanges: [65] } })
    expect(key(w, 65).attributes('data-target')).toBeDefined()
    expect(key(w, 65).find('.target-mark').exists()).toBe(true)
    expect(key(w, 65).find('.position-mark').exists()).toBe(true)
    expect(key(w, 65).find('.sr-only').text()).toBe('F 4, next, new hand position')
    expect(key(w, 64).attributes('data-target')).toBeUndefined()
  })

  it('highlights the keys in a reactive pressed set as it changes', async () => {
    const pressed = reactive(new Set<number>([64]))
    const w = await mountSuspended(KeyboardView, { props: { low: 60, high: 72, pressed } })
    expect(key(w, 64).attributes('data-pressed')).toBeDefined()
    pressed.add(67)
    pressed.delete(64)
    await nextTick()
    expect(key(w, 67).attributes('data-pressed')).toBeDefined()
    expect(key(w, 64).attributes('data-pressed')).toBeUndefined()
  })

  it('emits press with a louder velocity nearer the front edge, and release, with the events\' own time stamps', async () => {
    const w = await mountSuspended(KeyboardView, { props: { low: 60, high: 72 } })
    giveBox(w, 60)
    await key(w, 60).trigger('pointerdown', { pointerId: 1, button: 0, clientY: 10 })
    await key(w, 60).trigger('pointerup', { pointerId: 1, button: 0 })
    await key(w, 60).trigger('pointerdown', { pointerId: 2, button: 0, clientY: 95 })
    expect(presses(w).map(p => p[0])).toEqual([60, 60])
    const [back, front] = [presses(w)[0]![1], presses(w)[1]![1]]
    expect(front).toBeGreaterThan(back)
    expect(front).toBeLessThanOrEqual(127)
    expect(back).toBeGreaterThan(0)
    expect(key(w, 60).attributes('data-pressed')).toBeDefined()
    expect(releases(w)).toHaveLength(1)
    expect(releases(w)[0]![0]).toBe(60)
    expect(releases(w)[0]![1]).toBeGreaterThanOrEqual(presses(w)[0]![2])
  })

  it('plays a fixed velocity when one is given', async () => {
    const w = await mountSuspended(KeyboardView, { props: { low: 60, high: 72, velocity: 64 } })
    giveBox(w, 62)
    await key(w, 62).trigger('pointerdown', { pointerId: 1, button: 0, clientY: 95 })
    expect(presses(w)[0]!.slice(0, 2)).toEqual([62, 64])
  })

  it('keeps two touches on different keys as two held notes', async () => {
    const w = await mountSuspended(KeyboardView, { props: { low: 60, high: 72 } })
    await key(w, 60).trigger('pointerdown', { pointerId: 1, button: 0 })
    await key(w, 64).trigger('pointerdown', { pointerId: 2, button: 0 })
    await key(w, 60).trigger('pointerup', { pointerId: 1, button: 0 })
    expect(presses(w).map(p => p[0])).toEqual([60, 64])
    expect(releases(w).map(r => r[0])).toEqual([60])
    expect(key(w, 64).attributes('data-pressed')).toBeDefined()
  })

  it('is one tab stop; Enter and Space play the focused key, arrows move along the keys', async () => {
    const w = await mountSuspended(KeyboardView, { props: { low: 60, high: 72 }, attachTo: document.body })
    expect(keys(w).filter(k => k.attributes('tabindex') === '0').map(k => k.attributes('data-midi'))).toEqual(['60'])
    expect(key(w, 60).element.tagName).toBe('BUTTON')
    await key(w, 60).trigger('keydown', { key: 'Enter' })
    await key(w, 60).trigger('keydown', { key: 'Enter', repeat: true })
    await key(w, 60).trigger('keyup', { key: 'Enter' })
    expect(presses(w)).toEqual([[60, 80, expect.any(Number)]])
    expect(releases(w)).toEqual([[60, expect.any(Number)]])

    await key(w, 60).trigger('keydown', { key: 'ArrowRight' })
    await nextTick()
    expect(key(w, 61).attributes('tabindex')).toBe('0')
    expect(document.activeElement).toBe(key(w, 61).element)
    await key(w, 61).trigger('keydown', { key: ' ' })
    expect(presses(w).map(p => p[0])).toEqual([60, 61])
    w.unmount()
  })
})
