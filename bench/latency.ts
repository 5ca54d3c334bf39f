// The practice page in Debian's chromium: from a (fake) MIDI message's own time stamp to the first
// animation frame whose DOM shows the key highlighted, over 500 notes of free playing and over the notes
// of repeated attempts (where each note also moves the guide and is recorded); and the gzip size of the
// JavaScript the page loads. Figures only: this machine is shared, so nothing here is asserted.
//
// When a note comes matters as much as what the page does with it. Headless chromium's frame clock
// stops while nothing on the page changes, and a change then gets a frame at once; while something is
// being drawn (an animation, the last note's changes), a note waits for the clock's next 60 Hz tick.
// The first figure sends each note a fixed 20 ms after the frame that showed the last one, as earlier
// runs did, which holds every note at one place of the clock's cycle; the other two add a random part
// of a frame, as a key is pressed at no particular moment of a screen's cycle.
import { Note } from 'tonal'
import { gzipSync } from 'node:zlib'
import type { DrillNote } from '../shared/types/drill'
import { openStudentWithFakeMidi } from '../tests/support/browser'
import { FAKE_MIDI_INPUT_NAME } from '../tests/support/fake-midi'
import { closeTestDb, testDb } from '../tests/support/server'

const NOTES = 500
const ATTEMPTS = 20
const FRAME_MS = 1000 / 60

interface Sample { frame: number, dom: number }

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.ceil(p * sorted.length) - 1)]!
}

function report(heading: string, samples: Sample[]): void {
  const frame = samples.map(s => s.frame).sort((a, b) => a - b)
  const dom = samples.map(s => s.dom).sort((a, b) => a - b)
  const fmt = (n: number): string => n.toFixed(2).padStart(7)
  console.log(`practice page, ${heading}, message time stamp → highlight (ms):`)
  console.log(`  DOM updated      median ${fmt(percentile(dom, 0.5))}   p99 ${fmt(percentile(dom, 0.99))}   max ${fmt(dom.at(-1)!)}`)
  console.log(`  frame painted    median ${fmt(percentile(frame, 0.5))}   p99 ${fmt(percentile(frame, 0.99))}   max ${fmt(frame.at(-1)!)}   (goal: median ≤ 4, p99 ≤ 16.7)`)
}

// In the page: stamp a note-on with performance.now() as a MIDI message would carry, then wait for the
// first animation frame in which the key's element is marked pressed. A frame callback runs just before
// that frame is styled and painted (in the same task), so the clock read inside it is when the highlight
// goes to the screen, to within that frame's own rendering and the compositor. The callback's own
// argument is the frame's start, which can precede the message.
// Sent as text: tsx would wrap named functions in a helper that does not exist inside the page.
const MEASURE = `window.__measureHighlight = async (notes, spreadMs) => {
  const out = []
  for (const note of notes) {
    const el = document.querySelector('[data-midi="' + note + '"]')
    let domAt = 0
    const seen = new MutationObserver(() => {
      if (!domAt && el.hasAttribute('data-pressed')) domAt = performance.now()
    })
    seen.observe(el, { attributes: true })
    const stamp = performance.now()
    window.__fakeMidi.send([0x90, note, 80], stamp)
    const frameAt = await new Promise((resolve) => {
      const check = () => el.hasAttribute('data-pressed') ? resolve(performance.now()) : requestAnimationFrame(check)
      requestAnimationFrame(check)
    })
    seen.disconnect()
    out.push({ frame: frameAt - stamp, dom: (domAt || frameAt) - stamp })
    window.__fakeMidi.send([0x80, note, 0])
    await new Promise(r => setTimeout(r, 20 + Math.random() * spreadMs))
  }
  return out
}`
const measure = (notes: number[], spreadMs: number): string => `window.__measureHighlight(${JSON.stringify(notes)}, ${spreadMs})`

const row = await testDb()('drills').where({ title: 'C major scale, right hand' }).first('id', 'notes')
await closeTestDb()
const scale = (typeof row.notes === 'string' ? JSON.parse(row.notes) : row.notes as DrillNote[]).map((n: DrillNote) => Note.midi(n.pitch)!)
const browser = await openStudentWithFakeMidi()
try {
  const { page } = browser

  const scripts = new Map<string, number>()
  page.on('response', async (res) => {
    if (res.request().resourceType() !== 'script') return
    const body = await res.body().catch(() => null)
    if (body) scripts.set(res.url(), gzipSync(body).length)
  })
  // A fresh load of the practice page alone, so the figure is what a student's browser fetches to practise.
  await page.goto(`/practice/${row.id}`, { waitUntil: 'networkidle' })
  await page.locator('#midi-input').selectOption({ label: FAKE_MIDI_INPUT_NAME })
  await page.evaluate(MEASURE)
  const pageScripts = { files: scripts.size, gzipBytes: [...scripts.values()].reduce((a, b) => a + b, 0) }

  const keys = Array.from({ length: NOTES }, (_, i) => [60, 62, 64, 65, 67, 69, 71, 72][i % 8]!)
  report(`${NOTES} fake MIDI notes, free playing, each 20 ms after the last one's frame`, await page.evaluate<Sample[]>(measure(keys, 0)))
  report(`${NOTES} fake MIDI notes, free playing, at random moments of the frame`, await page.evaluate<Sample[]>(measure(keys, FRAME_MS)))

  // The scale as written, after the count-in, so every note also moves the guide and is recorded.
  const recorded: Sample[] = []
  for (let attempt = 0; attempt < ATTEMPTS; attempt++) {
    await page.getByTestId('start').click()
    await page.getByTestId('phase').filter({ hasText: 'Playing' }).waitFor({ timeout: 15_000 })
    recorded.push(...await page.evaluate<Sample[]>(measure(scale, FRAME_MS)))
    await page.getByTestId('start').filter({ hasText: 'Play again' }).waitFor({ timeout: 15_000 })
  }
  report(`${recorded.length} fake MIDI notes in ${ATTEMPTS} recorded attempts, at random moments of the frame`, recorded)
  console.log(`practice page JavaScript: ${pageScripts.files} files, ${(pageScripts.gzipBytes / 1024).toFixed(1)} KiB gzip`)
}
finally {
  await browser.close()
}
