// The settings page's screen-delay test in Debian's chromium: fake MIDI note-ons timed by the page's
// own useLatencyProbe and read back through `?probe=1`, so the figure is the one a student is shown.
// Needs the test stack running (EVENHAND_TEST_URL), as `npm run bench:browser` sets up for bench/latency.ts.
// Headless chromium draws without a GPU or a real display: the page's own cost up to the painting
// frame, not what a student's monitor adds.
import { summariseLatency } from '../composables/useLatencyProbe'
import { openStudentWithFakeMidi } from '../tests/support/browser'
import { FAKE_MIDI_INPUT_NAME } from '../tests/support/fake-midi'

const ROUNDS = 5
const SPACING_MS = 150

const browser = await openStudentWithFakeMidi()
try {
  const { page } = browser
  await page.goto('/settings?probe=1')
  await page.locator('#play-with').selectOption({ label: `${FAKE_MIDI_INPUT_NAME} (MIDI)` })
  const presses = Number((await page.getByTestId('latency-progress').textContent())?.match(/of (\d+)/)?.[1])
  const all: number[] = []
  console.log(`settings page screen-delay test: ${ROUNDS} rounds of ${presses} fake MIDI note-ons, ${SPACING_MS} ms apart`)
  for (let round = 1; round <= ROUNDS; round++) {
    const again = page.getByRole('button', { name: 'Start the test again' })
    if (await again.isVisible()) await again.click()
    const notes = Array.from({ length: presses }, (_, i) => ({ note: 48 + (i % 25), velocity: 70, atMs: i * SPACING_MS, holdMs: 60 }))
    await page.evaluate(n => (window as unknown as { __fakeMidi: { play: (n: unknown) => Promise<void> } }).__fakeMidi.play(n), notes)
    await page.getByTestId('latency-progress').filter({ hasText: 'Done' }).waitFor()
    const samples = await page.evaluate(() => [...(window.__evenhandLatency ?? [])])
    all.push(...samples)
    const s = summariseLatency(samples)!
    console.log(`  round ${round}: median ${s.medianMs.toFixed(2)} ms, worst ${s.worstMs.toFixed(2)} ms`)
  }
  const s = summariseLatency(all)!
  console.log(`  all ${s.count}: median ${s.medianMs.toFixed(2)} ms, worst ${s.worstMs.toFixed(2)} ms, ${s.withinFrame ? 'within' : 'over'} one 60 Hz frame`)
}
finally {
  await browser.close()
}
