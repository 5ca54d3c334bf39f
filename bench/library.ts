// The drill editor's heavy steps for a 2,000-note drill, as the upload route and the editor run them:
// reading a MusicXML file and a Standard MIDI File (importDrillFile, with its type sniffing and limits),
// and the suggestion for the drill read (one hand's fingering, then a hand for every note as "suggest
// hands" does for a both-hands drill). Goal: each under 200 ms. Figures only: the machine is shared.
import { fileURLToPath } from 'node:url'
import { exportDrillMusicXml, exportDrillSmf, importDrillFile, midiFromName, nameFromMidi, suggestFingering, suggestHands, type DrillMusic } from '../shared/engine'
import { seededRandom } from '../shared/utils/random'

const NOTES = 2000
const RUNS = 10

/** A right-hand passage of eighths and quarters, steps up to a fourth, with the fingers left open. */
function passage(): DrillMusic {
  const random = seededRandom(2000)
  let midi = 67
  let beat = 0
  const notes = Array.from({ length: NOTES }, () => {
    midi = Math.min(88, Math.max(55, midi + Math.round((random() - 0.5) * 10)))
    const length = random() < 0.8 ? 0.5 : 1
    const note = { pitch: nameFromMidi(midi), beat, length }
    beat += length
    return note
  })
  return { hand: 'right', tempoBpm: 96, notes }
}

/** The fastest and the median of RUNS runs (the fastest is the one least disturbed by other work). */
function time(label: string, run: () => void): void {
  run()
  const ms: number[] = []
  for (let k = 0; k < RUNS; k++) {
    const start = performance.now()
    run()
    ms.push(performance.now() - start)
  }
  ms.sort((a, b) => a - b)
  console.log(`  ${label.padEnd(52)} best ${ms[0]!.toFixed(1)} ms  median ${ms[Math.floor(RUNS / 2)]!.toFixed(1)} ms  (goal < 200 ms)`)
}

export function benchLibrary(): void {
  const drill = passage()
  const xml = new TextEncoder().encode(exportDrillMusicXml(drill, { meter: '4/4', title: 'Bench passage' }))
  const smf = exportDrillSmf(drill, 'Bench passage')
  console.log(`drill files of ${NOTES.toLocaleString('en')} notes (MusicXML ${(xml.length / 1024).toFixed(0)} KB, MIDI ${(smf.length / 1024).toFixed(0)} KB), ${RUNS} runs each:`)
  let read = drill
  time('import MusicXML', () => {
    read = importDrillFile(xml).drill
  })
  if (read.notes.length !== NOTES) throw new Error(`MusicXML import read ${read.notes.length} notes`)
  time('import MIDI', () => {
    const midi = importDrillFile(smf).drill
    if (midi.notes.length !== NOTES) throw new Error(`MIDI import read ${midi.notes.length} notes`)
  })
  const line = read.notes.map(n => midiFromName(n.pitch))
  time('suggest fingering for the imported drill', () => {
    const { fingers } = suggestFingering({ hand: 'right', notes: line })
    if (fingers.length !== NOTES) throw new Error(`suggestion gave ${fingers.length} fingers`)
  })
  time('suggest hands and fingers for it (both hands)', () => {
    suggestHands({ notes: line })
  })
}

if (process.argv[1] === fileURLToPath(import.meta.url)) benchLibrary()
