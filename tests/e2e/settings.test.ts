import { describe, expect, it } from 'vitest'
import { summariseLatency } from '../../composables/useLatencyProbe'
import { browserForFile, openStudentWithFakeMidi } from '../support/browser'
import { FAKE_MIDI_INPUT_NAME } from '../support/fake-midi'

const browser = browserForFile(openStudentWithFakeMidi)

describe('the settings page', () => {
  it('keeps the chosen device, hand size, sound and key-map octave through a reload', async () => {
    const { page } = browser
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Settings' }).click()
    await page.waitForURL(/\/settings$/)
    await expect.poll(() => page.locator('#play-with option').evaluateAll(all => all.map(o => o.textContent?.trim()))).toContain(`${FAKE_MIDI_INPUT_NAME} (MIDI)`)
    await page.locator('#play-with').selectOption({ label: `${FAKE_MIDI_INPUT_NAME} (MIDI)` })
    await page.getByRole('radio', { name: /Large/ }).check()
    await page.getByTestId('sound-on').uncheck()
    expect(await page.getByTestId('key-map-octave').textContent()).toContain('A plays C4')
    await page.getByRole('button', { name: 'Octave up' }).click()
    expect(await page.locator('[data-key="K"]').textContent()).toContain('C6')

    await page.reload()
    await expect.poll(() => page.getByTestId('midi-status').textContent()).toContain(`Listening to “${FAKE_MIDI_INPUT_NAME}”`)
    expect(await page.getByRole('radio', { name: /Large/ }).isChecked()).toBe(true)
    expect(await page.getByRole('radio', { name: /Medium/ }).isChecked()).toBe(false)
    expect(await page.getByTestId('sound-on').isChecked()).toBe(false)
    expect(await page.getByTestId('key-map-octave').textContent()).toContain('A plays C5')
    expect(await page.locator('#play-with').inputValue()).toBe('midi:fake-input-1')
  })

  it('times fake MIDI presses to the painted key and reports their median', async () => {
    const { page } = browser
    await page.goto('/settings?probe=1')
    await page.getByTestId('latency-progress').filter({ hasText: `0 of 20` }).waitFor()
    const notes = [60, 62, 64, 65, 67].map((note, i) => ({ note, velocity: 70, atMs: i * 120, holdMs: 80 }))
    await page.evaluate(n => (window as unknown as { __fakeMidi: { play: (n: unknown) => Promise<void> } }).__fakeMidi.play(n), notes)

    await page.getByTestId('latency-progress').filter({ hasText: '5 of 20' }).waitFor()
    const samples = await page.evaluate(() => window.__evenhandLatency ?? [])
    expect(samples).toHaveLength(5)
    for (const s of samples) expect(s).toBeGreaterThanOrEqual(0)
    const summary = summariseLatency(samples)!
    expect(await page.getByTestId('latency-median').textContent()).toBe(`${summary.medianMs.toFixed(1)} ms`)
    expect(await page.getByTestId('latency-worst').textContent()).toBe(`${summary.worstMs.toFixed(1)} ms`)
    expect(await page.getByTestId('latency-verdict').textContent()).toMatch(summary.withinFrame ? /Within one frame/ : /Slower than one frame/)
    // Every key was released again, so none is left drawn held.
    expect(await page.locator('[data-testid="keyboard"] [data-pressed]').count()).toBe(0)
  })
})
