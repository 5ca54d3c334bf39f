// The practice page in Debian's chromium: from a (fake) MIDI message's own time stamp to the first
// animation frame whose DOM shows the key highlighted, for notes played as a pianist plays them (free
// playing, and repeated recorded attempts where each note also moves the guide and is recorded); and
// the gzip size of the JavaScript the page loads. Figures only: this machine is shared, so nothing here
// is asserted.
//
// When a note comes matters as much as what the page does with it. Headless chromium's frame clock
// stops while nothing on the page changes, and a change then gets a frame at once; while something is
// being drawn (the last note's release, the guide moving on, the metronome's beat), a note waits for
// the clock's next 60 Hz tick. So the notes here come at a player's pace, with each key held and
// released as a player's would be, at no particular moment of the frame:
// - détaché: each key released before the next is pressed;
// - legato: the next key pressed before the last is released, as in a scale;
// - a run at 16 notes a second, about the fastest passage-work a pianist plays (from memory);
// - back to back: a note every 40 ms (25 a second), faster than any player, as a stress case;
// and the last two again on a bare page that only marks the key, as a control.
// Each note is stamped with the moment it was due, not the moment its timer ran: a real message
// carries the time the browser received it, and it too waits for whatever the page is doing.
// A page just loaded runs its note path unoptimised until the JavaScript engine has compiled it,
// which takes a few dozen notes: each page's first notes are reported apart ("first notes"), and
// the scenarios after them show what a student hears and sees for the rest of a session.
import { Note } from 'tonal'
import { gzipSync } from 'node:zlib'
import type { DrillNote } from '../shared/types/drill'
import { openStudentWithFakeMidi } from '../tests/support/browser'
import { FAKE_MIDI_INPUT_NAME } from '../tests/support/fake-midi'
import { closeTestDb, testDb } from '../tests/support/server'

const NOTES = 500
const ATTEMPTS = 20
/** Notes played on a page just loaded, before its steady-state scenarios. */
const FIRST_NOTES = 60
const FRAME_MS = 1000 / 60

/** Per note: ms to the first frame showing it, ms to the DOM change, and frames drawn until then. */
interface Sample { frame: number, dom: number, frames: number }
/** A key pressed `onMs` and released `offMs` after the start of a run. */
interface Press { note: number, onMs: number, offMs: number }

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.ceil(p * sorted.length) - 1)]!
}

function report(heading: string, samples: Sample[]): void {
  const frame = samples.map(s => s.frame).sort((a, b) => a - b)
  const dom = samples.map(s => s.dom).sort((a, b) => a - b)
  const nextFrame = samples.filter(s => s.frames === 1).length / samples.length
  // A timer may run a fraction of a millisecond before its due time; that reads as zero, not -0.00.
  const fmt = (n: number): string => Math.max(0, n).toFixed(2).padStart(7)
  console.log(`${heading}, message time stamp → highlight (ms):`)
  console.log(`  DOM updated      median ${fmt(percentile(dom, 0.5))}   p99 ${fmt(percentile(dom, 0.99))}   max ${fmt(dom.at(-1)!)}`)
  console.log(`  frame painted    median ${fmt(percentile(frame, 0.5))}   p99 ${fmt(percentile(frame, 0.99))}   max ${fmt(frame.at(-1)!)}   (goal: median ≤ 4, p99 ≤ 16.7)`)
  console.log(`  shown in the first frame drawn after the message: ${(nextFrame * 100).toFixed(1)} % of ${samples.length} notes`)
}

/**
 * `count` presses over `keys` in turn, one every `gapMs` plus up to a frame at random; each held for
 * `holdMs` (longer than the gap: legato). The first press comes a second in, after the page is still.
 */
function presses(keys: number[], count: number, gapMs: number, holdMs: number): Press[] {
  let at = 1000
  return Array.from({ length: count }, (_, i) => {
    const onMs = at
    at += gapMs + Math.random() * FRAME_MS
    return { note: keys[i % keys.length]!, onMs, offMs: onMs + holdMs }
  })
}

// In the page: each note-on goes out through the fake input when due, stamped with that moment; then
// the page's animation frames are counted until one finds the key's element marked pressed. A frame
// callback runs just before that frame is styled and painted (in the same task), so the clock read
// inside it is when the highlight goes to the screen, to within that frame's own rendering and the
// compositor. Releases go out when due and are not measured.
// Sent as text: tsx would wrap named functions in a helper that does not exist inside the page.
const MEASURE = `window.__measureHighlight = (plan) => new Promise((resolve) => {
  const out = []
  const t0 = performance.now()
  const at = (ms, fn) => setTimeout(fn, Math.max(0, t0 + ms - performance.now()))
  for (const press of plan) {
    at(press.onMs, () => {
      const el = document.querySelector('[data-midi="' + press.note + '"]')
      const stamp = t0 + press.onMs
      let domAt = 0
      const seen = new MutationObserver(() => {
        if (!domAt && el.hasAttribute('data-pressed')) domAt = performance.now()
      })
      seen.observe(el, { attributes: true })
      window.__fakeMidi.send([0x90, press.note, 80], stamp)
      let frames = 0
      const check = () => {
        frames++
        if (!el.hasAttribute('data-pressed')) return requestAnimationFrame(check)
        const frameAt = performance.now()
        seen.disconnect()
        out.push({ frame: frameAt - stamp, dom: (domAt || frameAt) - stamp, frames })
        if (out.length === plan.length) setTimeout(() => resolve(out), 200)
      }
      requestAnimationFrame(check)
    })
    at(press.offMs, () => window.__fakeMidi.send([0x80, press.note, 0], t0 + press.offMs))
  }
})`
const measure = (page: import('playwright-core').Page, plan: Press[]): Promise<Sample[]> =>
  page.evaluate<Sample[]>(`window.__measureHighlight(${JSON.stringify(plan)})`)

const row = await testDb()('drills').where({ title: 'C major scale, right hand' }).first('id', 'notes')
const both = await testDb()('drills').where({ title: 'D major scale, hands together' }).first('id', 'notes')
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
  await page.locator('#play-with').selectOption({ label: `${FAKE_MIDI_INPUT_NAME} (MIDI)` })
  await page.evaluate(MEASURE)
  const pageScripts = { files: scripts.size, gzipBytes: [...scripts.values()].reduce((a, b) => a + b, 0) }

  const keys = [60, 62, 64, 65, 67, 69, 71, 72]
  report(`practice page just loaded, first ${FIRST_NOTES} fake MIDI notes, legato, about 8 a second`, await measure(page, presses(keys, FIRST_NOTES, 110, 130)))
  const free: [string, Press[]][] = [
    ['détaché, about 8 a second', presses(keys, NOTES, 110, 70)],
    ['legato, about 8 a second', presses(keys, NOTES, 110, 130)],
    ['legato run, about 16 a second', presses(keys, NOTES, 55, 75)],
    ['back to back, 25 a second', presses(keys, NOTES, 32, 50)],
  ]
  for (const [how, plan] of free) report(`practice page, ${NOTES} fake MIDI notes, free playing ${how}`, await measure(page, plan))

  // The scale, legato, after the count-in, so every note also moves the guide and is recorded while
  // the metronome beats.
  const recorded: Sample[] = []
  for (let attempt = 0; attempt < ATTEMPTS; attempt++) {
    await page.getByTestId('start').click()
    await page.getByTestId('phase').filter({ hasText: 'Playing' }).waitFor({ timeout: 15_000 })
    recorded.push(...await measure(page, presses(scale, scale.length, 110, 130)))
    await page.getByTestId('start').filter({ hasText: 'Play again' }).waitFor({ timeout: 15_000 })
  }
  report(`practice page, ${recorded.length} fake MIDI notes in ${ATTEMPTS} recorded attempts, legato, about 8 a second`, recorded)

  // The practice tools running: a both-hands drill looped right hand alone, with the app sounding the
  // left hand at tempo, so every pass is graded and saved while the next one plays.
  const bothNotes: DrillNote[] = typeof both.notes === 'string' ? JSON.parse(both.notes) : both.notes
  const right = bothNotes.filter(n => n.hand === 'right').map(n => Note.midi(n.pitch)!)
  await page.goto(`/practice/${both.id}`)
  await page.locator('#play-with').selectOption({ label: `${FAKE_MIDI_INPUT_NAME} (MIDI)` })
  await page.getByTestId('practice-tools').locator('summary').click()
  await page.locator('#hand').selectOption('right')
  await page.getByTestId('other-hand').check()
  await page.getByTestId('loop').check()
  await page.evaluate(MEASURE)
  await page.getByTestId('start').click({ timeout: 30_000 })
  await page.getByTestId('phase').filter({ hasText: 'Playing' }).waitFor({ timeout: 15_000 })
  const first = await measure(page, presses(right, FIRST_NOTES, 110, 130))
  const looped = await measure(page, presses(right, NOTES / 2, 110, 130))
  const passes = await page.getByRole('heading', { name: /^Pass \d+$/ }).textContent().catch(() => 'none')
  await page.getByRole('button', { name: 'Stop, don\'t keep' }).click()
  report(`loop page just loaded, first ${first.length} fake MIDI notes, right hand alone with the left hand sounded`, first)
  report(`practice page, ${looped.length} fake MIDI notes after those, right hand alone in a loop with the left hand sounded (last: ${passes})`, looped)
  console.log(`practice page JavaScript: ${pageScripts.files} files, ${(pageScripts.gzipBytes / 1024).toFixed(1)} KiB gzip`)

  // The control: a bare page whose only work is to mark a key pressed, timed the same way. What it
  // shows is this browser's own frame clock, which no page code can beat.
  await page.goto('/samples/LICENSE')
  await page.evaluate(`(async () => {
    const input = [...(await navigator.requestMIDIAccess()).inputs.values()][0]
    const style = 'display:inline-block;width:40px;height:120px;margin:2px;background:#eee'
    document.body.innerHTML = '<style>[data-pressed]{background:#c33!important}</style>'
      + ${JSON.stringify(keys)}.map(k => '<div style="' + style + '" data-midi="' + k + '"></div>').join('')
    input.onmidimessage = (e) => {
      const key = document.querySelector('[data-midi="' + e.data[1] + '"]')
      if ((e.data[0] & 0xF0) === 0x90 && e.data[2] > 0) key.setAttribute('data-pressed', '')
      else key.removeAttribute('data-pressed')
    }
  })()`)
  await page.evaluate(MEASURE)
  report(`control just loaded, first ${FIRST_NOTES} notes, legato, about 8 a second`, await measure(page, presses(keys, FIRST_NOTES, 110, 130)))
  for (const [how, plan] of free.slice(2)) report(`control: a bare page marking keys, ${NOTES} notes ${how}`, await measure(page, plan))
}
finally {
  await browser.close()
}
