// What finishing and keeping a long attempt costs in the browser: placing 20,000 raw events
// (the most AttemptInput allows) on the time line, validating them, and the size and time of
// the JSON copy the outbox writes to localStorage before sending.
import { AttemptInput } from '../shared/types/attempt'
import type { LiveNoteEvent } from '../shared/types/live'
import { toPlayedEvents } from '../shared/utils/timeline'
import { medianMs } from './timing'

export function benchPractice(): void {
  const count = 20_000
  // Sixteenth notes at 120 bpm over a C-major span, each held for 100 ms.
  const raw: LiveNoteEvent[] = []
  for (let k = 0; k < count / 2; k++) {
    const at = 10_000 + k * 125 + Math.sin(k) * 8
    const note = 60 + [0, 2, 4, 5, 7, 9, 11, 12][k % 8]!
    raw.push({ note, on: true, velocity: 64 + (k % 20), timeStampMs: at, source: 'midi' }, { note, on: false, velocity: 0, timeStampMs: at + 100, source: 'midi' })
  }
  const events = toPlayedEvents(raw, 10_000, 120)
  const attempt = {
    id: '6f1c2a52-8d0e-4c4e-9b7a-1f2d3c4b5a60',
    drillId: 1,
    drillVersion: 1,
    startedAt: new Date().toISOString(),
    tempoBpm: 120,
    inputDevice: 'midi' as const,
    events,
  }
  const json = JSON.stringify({ attempt })
  console.log(`practice: ${count} events`)
  console.log(`  toPlayedEvents         ${medianMs(() => toPlayedEvents(raw, 10_000, 120), 15).toFixed(1)} ms`)
  console.log(`  AttemptInput.parse     ${medianMs(() => AttemptInput.parse(attempt), 15).toFixed(1)} ms`)
  console.log(`  JSON copy for storage  ${medianMs(() => JSON.stringify({ attempt }), 15).toFixed(1)} ms, ${(json.length / 1024).toFixed(0)} KiB`)
}

if (import.meta.url === `file://${process.argv[1]}`) benchPractice()
