// The drill editor in chromium, as a new teacher uses it: a MusicXML file and a MIDI file read into
// the editor, a drill typed with its preview on the keys and the note strip, a suggestion, a finger
// changed into an awkward spot the engine names, saved into the library and opened for practice; and
// a drill played in on the (fake) MIDI keyboard, trimmed and snapped to triplets.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { exportDrillMusicXml, exportDrillSmf, midiFromName, parseNotation, suggestFingering, type DrillMusic } from '../../shared/engine'
import { openBrowser, signUpTeacher } from '../support/browser'
import type { BrowserSession } from '../support/browser'
import { fakeMidiScript } from '../support/fake-midi'
import { closeTestDb } from '../support/server'

let teacher: BrowserSession

/** What the note list shows, one "pitch finger" pair per note (· for an open finger). */
async function noteList(page: Page): Promise<string[]> {
  return (await page.getByTestId('note-fingers').locator('button').allInnerTexts()).map(t => t.replace(/\s+/g, ' ').trim())
}

async function upload(page: Page, name: string, bytes: Uint8Array | string): Promise<string> {
  await page.getByRole('tab', { name: 'Upload MIDI or MusicXML' }).click()
  await page.locator('input[type=file]').setInputFiles({ name, mimeType: 'application/octet-stream', buffer: Buffer.from(bytes) })
  await page.getByRole('button', { name: 'Read the file' }).click()
  const message = page.getByTestId('upload-message').filter({ hasText: /^Read \d+ notes/ })
  await message.waitFor()
  return message.innerText()
}

beforeAll(async () => {
  teacher = await openBrowser({ initScript: fakeMidiScript })
  await signUpTeacher(teacher.page, 'Maren Oduya')
})
afterAll(async () => {
  await teacher?.close()
  await closeTestDb()
})

describe('the drill editor', () => {
  it('reads files, previews a typed drill, suggests, flags an awkward finger, saves it and opens it for practice', async () => {
    const page = teacher.page
    await page.goto('/teacher/drills/new')

    // A both-hands MusicXML file written by the engine's exporter: the right hand's fingers come back.
    const xmlDrill: DrillMusic = { hand: 'both', tempoBpm: 72, notes: parseNotation('RH E4/3 F4/4\nLH C3/5:2', { hand: 'both' }) }
    expect(await upload(page, 'two-hands.musicxml', exportDrillMusicXml(xmlDrill, { meter: '2/4' }))).toContain('Read 3 notes')
    expect((await noteList(page)).map(t => t.replace(/\s/g, '')).sort()).toEqual(['C3L5', 'E4R3', 'F4R4'])
    expect(await page.locator('select[name=hand]').inputValue()).toBe('both')

    // A one-hand MIDI file: its notes and tempo arrive, fingers are for the teacher to add.
    const midDrill: DrillMusic = { hand: 'left', tempoBpm: 96, notes: ['C3', 'G2', 'E3', 'G2'].map((pitch, beat) => ({ pitch, beat, length: 1 })) }
    expect(await upload(page, 'bass.mid', exportDrillSmf(midDrill))).toContain('Read 4 notes')
    expect((await noteList(page)).map(t => t.replace(/\s/g, '').replace(/[RL]/, ''))).toEqual(['C3·', 'G2·', 'E3·', 'G2·'])
    expect(await page.locator('input[name=tempo]').inputValue()).toBe('96')

    // Now a typed right-hand drill: the preview follows as the teacher types.
    await page.locator('select[name=hand]').selectOption('right')
    await page.getByRole('tab', { name: 'Type notes' }).click()
    await page.getByLabel('Title').fill('Rising G, thumb under')
    const notation = page.getByLabel('Notes in the drill notation')
    await notation.fill('G4 A4 B4 C5 | D5 E5 F#5 G5')
    const strip = page.getByTestId('drill-preview').getByTestId('note-strip')
    await strip.getByText('F#5').waitFor()
    await expect.poll(() => strip.locator('li').count()).toBe(8)
    await notation.fill('G4 A4 B4 C5 | D5 E5 F#5 G5 | A5')
    await expect.poll(() => strip.locator('li').count()).toBe(9)
    await notation.fill('G4 A4 B4 C5 | D5 E5 F#5 G5')
    await expect.poll(() => strip.locator('li').count()).toBe(8)

    // Suggest all: the engine's fingering for the line, shown in the list and on the keys.
    await page.getByRole('button', { name: 'Suggest all' }).click()
    const line = ['G4', 'A4', 'B4', 'C5', 'D5', 'E5', 'F#5', 'G5']
    const expected = suggestFingering({ hand: 'right', notes: line.map(midiFromName) }).fingers as number[]
    await expect.poll(async () => (await noteList(page)).map(t => t.replace(/\s/g, ''))).toEqual(line.map((p, i) => `${p}${expected[i]}`))
    const keyboard = page.getByTestId('drill-preview').getByTestId('keyboard')
    expect(await keyboard.locator('[data-midi="67"]').innerText()).toContain(`finger ${expected[0]}`)
    // Played back at its tempo: the keys light as the notes sound, the first key first.
    await page.getByTestId('preview-play').click()
    await keyboard.locator('[data-midi="67"][data-pressed]').waitFor()
    await keyboard.locator('[data-midi="79"][data-pressed]').waitFor()
    await page.getByTestId('preview-play').filter({ hasText: /^Play it at 96 bpm$/ }).waitFor()
    // The typed text follows the suggestion, so typing goes on from it.
    expect(await notation.inputValue()).toContain(`G4/${expected[0]}`)

    // A finger changed by hand into the same finger twice in a row: the engine's check names it.
    await page.locator('[data-note="1"]').click()
    await page.locator('[data-note="1"]').press(String(expected[0]))
    const issues = page.getByTestId('fingering-issues')
    await issues.getByText('plays two keys in a row').waitFor()
    await page.getByRole('button', { name: 'Undo' }).click()
    await expect.poll(() => issues.count()).toBe(0)
    await page.getByRole('button', { name: 'Redo' }).click()
    await issues.getByText('plays two keys in a row').waitFor()

    await page.getByRole('button', { name: 'Save drill' }).click()
    await page.waitForURL(/\/teacher\/drills\/\d+$/)
    const id = Number(page.url().split('/').pop())
    await page.getByRole('heading', { name: 'Rising G, thumb under' }).waitFor()

    await page.goto('/teacher/drills')
    await page.getByTestId('library').getByRole('link', { name: 'Rising G, thumb under' }).click()
    await page.waitForURL(new RegExp(`/teacher/drills/${id}$`))
    await page.getByRole('link', { name: 'Play it' }).click()
    await page.waitForURL(new RegExp(`/practice/${id}$`))
    const practiceStrip = page.getByTestId('note-strip')
    await practiceStrip.getByText('F#5').waitFor()
    expect(await practiceStrip.locator('li').count()).toBe(8)
  })

  it('records a drill on the MIDI keyboard, trims the stray notes and snaps it to triplets', async () => {
    const page = teacher.page
    await page.goto('/teacher/drills/new')
    await page.getByLabel('Title').fill('Triplets played in')
    await page.locator('input[name=tempo]').fill('90')
    await page.getByRole('tab', { name: 'Play it in' }).click()
    const recorder = page.getByTestId('recorder')
    await recorder.getByTestId('midi-status').getByText('Listening to').waitFor()
    // Played freely first, without the click: the first kept note is beat 0.
    await recorder.locator('input[name=click]').uncheck()
    await recorder.getByTestId('record-start').click()
    // A stray low note, six triplet eighths and a quarter at 90 bpm (a beat of 666.7 ms, a triplet
    // eighth of 222.2 ms), each up to 25 ms off, then a stray note at the end. Time stamps are the
    // MIDI messages' own, as a keyboard sends them.
    await page.evaluate(() => {
      const fake = (window as unknown as { __fakeMidi: { send: (data: number[], t: number) => void } }).__fakeMidi
      const t0 = performance.now() - 5000
      const third = 60_000 / 90 / 3
      const played: [number, number, number][] = [[36, -900, 200], [60, 0, 200], [62, third + 20, 190], [64, 2 * third - 25, 200],
        [65, 3 * third + 10, 210], [67, 4 * third - 15, 190], [69, 5 * third + 25, 180], [71, 6 * third - 10, 640], [84, 6 * third + 1500, 100]]
      const events = played.flatMap(([note, at, hold]) => [{ data: [0x90, note, 70], t: t0 + at }, { data: [0x80, note, 0], t: t0 + at + hold }])
      for (const e of events.sort((a, b) => a.t - b.t)) fake.send(e.data, e.t)
    })
    await recorder.getByTestId('record-stop').click()
    await recorder.getByTestId('record-status').getByText('Recorded 9 notes').waitFor()

    await recorder.locator('input[name=trim-first]').fill('2')
    await recorder.locator('input[name=trim-last]').fill('8')
    await recorder.locator('input[name=played-bpm]').fill('90')
    await recorder.locator('select[name=grid]').selectOption('sixteenth')
    await recorder.getByTestId('record-result').getByText('Keeps 7 notes, from C4 to B4').waitFor()
    await recorder.locator('select[name=grid]').selectOption('triplet')
    await recorder.getByTestId('record-use').click()

    await expect.poll(async () => (await noteList(page)).map(t => t.replace(/\s|·/g, ''))).toEqual(['C4', 'D4', 'E4', 'F4', 'G4', 'A4', 'B4'])
    await page.getByRole('tab', { name: 'Type notes' }).click()
    // In thirds of a beat; the quarter is held one beat.
    expect((await page.getByLabel('Notes in the drill notation').inputValue()).replace(/\s+/g, ' ')).toBe('C4:1/3 D4 E4 F4 G4 A4 B4:1')

    // Against the metronome's click: its beats are the grid's, so a drill that starts on the "and" of
    // beat 2 keeps its half-beat rest. Eighths at 90 bpm (333.3 ms), each up to 30 ms off the click.
    await page.getByRole('tab', { name: 'Play it in' }).click()
    await recorder.locator('input[name=click]').check()
    await recorder.getByTestId('record-start').click()
    await expect.poll(() => recorder.getAttribute('data-beat-zero')).not.toBeNull()
    await page.evaluate(() => {
      const fake = (window as unknown as { __fakeMidi: { send: (data: number[], t: number) => void } }).__fakeMidi
      const zero = Number(document.querySelector('[data-testid=recorder]')!.getAttribute('data-beat-zero'))
      const beat = 60_000 / 90
      const played: [number, number, number][] = [[67, 1.5 * beat + 20, 300], [65, 2 * beat - 30, 300], [64, 2.5 * beat + 15, 300], [62, 3 * beat, 640]]
      for (const [note, at, hold] of played) {
        fake.send([0x90, note, 70], zero + at)
        fake.send([0x80, note, 0], zero + at + hold)
      }
    })
    await recorder.getByTestId('record-stop').click()
    await recorder.getByTestId('record-status').getByText('Recorded 4 notes').waitFor()
    await recorder.locator('select[name=grid]').selectOption('eighth')
    await recorder.getByTestId('record-use').click()
    await page.getByRole('tab', { name: 'Type notes' }).click()
    expect((await page.getByLabel('Notes in the drill notation').inputValue()).replace(/\s+/g, ' ')).toBe('r:1/2 G4 F4 E4 D4:1')

    // On the on-screen keys too: two keys clicked are two notes.
    await page.getByRole('tab', { name: 'Play it in' }).click()
    await recorder.getByTestId('play-with').selectOption('screen')
    await recorder.locator('input[name=click]').uncheck()
    await recorder.getByTestId('record-start').click()
    await recorder.getByTestId('keyboard').locator('[data-midi="64"]').click()
    await recorder.getByTestId('keyboard').locator('[data-midi="67"]').click()
    await recorder.getByTestId('record-stop').click()
    await recorder.getByTestId('record-status').getByText('Recorded 2 notes: E4 G4').waitFor()
  })

  it('gives a both-hands drill a hand per note, by the engine and by hand', async () => {
    const page = teacher.page
    await page.goto('/teacher/drills/new')
    await page.locator('select[name=hand]').selectOption('both')
    await page.getByLabel('Notes in the drill notation').fill('RH C5 D5 E5 F5 G5\nLH C3 G2 C3 G2 C3')
    await expect.poll(async () => (await noteList(page)).length).toBe(10)
    await page.getByRole('button', { name: 'Suggest hands' }).click()
    // A line an octave and more apart: the engine keeps the upper notes in the right hand.
    await expect.poll(async () => (await noteList(page)).filter(t => t.startsWith('C5R')).length).toBe(1)
    await page.locator('[data-note="0"]').click()
    const hand = page.getByTestId('note-hand')
    await hand.getByRole('button', { name: 'left hand' }).click()
    expect(await hand.getByRole('button', { name: 'left hand' }).getAttribute('aria-pressed')).toBe('true')
    expect((await noteList(page)).filter(t => t.startsWith('C5L')).length).toBe(1)
    expect(await page.getByLabel('Notes in the drill notation').inputValue()).toMatch(/LH .*C5/)
  })
})
