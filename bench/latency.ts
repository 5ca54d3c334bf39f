// The practice page in Debian's chromium: from a (fake) MIDI message's own time stamp to the first
// animation frame whose DOM shows the key highlighted, over 500 notes; and the gzip size of the
// JavaScript the page loads. Figures only: this machine is shared, so nothing here is asserted.
import { gzipSync } from 'node:zlib'
import { openStudentWithFakeMidi } from '../tests/support/browser'
import { FAKE_MIDI_INPUT_NAME } from '../tests/support/fake-midi'
import { closeTestDb, testDb } from '../tests/support/server'

const NOTES = 500

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.ceil(p * sorted.length) - 1)]!
}

const drill = await testDb()('drills').where({ title: 'C major scale, right hand' }).first('id')
await closeTestDb()
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
  await page.goto(`/practice/${drill.id}`, { waitUntil: 'networkidle' })
  await page.locator('#midi-input').selectOption({ label: FAKE_MIDI_INPUT_NAME })

  // In the page: stamp a note-on with performance.now() as a MIDI message would carry, then wait for the
  // first animation frame in which the key's element is marked pressed. A frame callback runs just before
  // that frame is painted, so the clock read inside it is when the highlight goes to the screen (to within
  // the compositor). The callback's own argument is the frame's start, which can precede the message.
  // Sent as text: tsx would wrap named functions in a helper that does not exist inside the page.
  const samples: { frame: number, dom: number }[] = await page.evaluate(`(async (count) => {
    const keys = [60, 62, 64, 65, 67, 69, 71, 72]
    const out = []
    for (let i = 0; i < count; i++) {
      const note = keys[i % keys.length]
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
      await new Promise(r => setTimeout(r, 20))
    }
    return out
  })(${NOTES})`)

  const frame = samples.map(s => s.frame).sort((a, b) => a - b)
  const dom = samples.map(s => s.dom).sort((a, b) => a - b)
  const fmt = (n: number): string => n.toFixed(2).padStart(7)
  console.log(`practice page, ${NOTES} fake MIDI notes, message time stamp → highlight (ms):`)
  console.log(`  DOM updated      median ${fmt(percentile(dom, 0.5))}   p99 ${fmt(percentile(dom, 0.99))}   max ${fmt(dom.at(-1)!)}`)
  console.log(`  frame painted    median ${fmt(percentile(frame, 0.5))}   p99 ${fmt(percentile(frame, 0.99))}   max ${fmt(frame.at(-1)!)}   (goal: median ≤ 4, p99 ≤ 16.7)`)
  const total = [...scripts.values()].reduce((a, b) => a + b, 0)
  console.log(`practice page JavaScript: ${scripts.size} files, ${(total / 1024).toFixed(1)} KiB gzip`)
}
finally {
  await browser.close()
}
