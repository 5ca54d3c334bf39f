import { describe, expect, it } from 'vitest'
import { parseMidi } from 'midi-file'
import { EXPORT_PPQ, exportAttemptSmf, exportDrillSmf, importSmf } from '../../../shared/engine/smf'
import { ImportError } from '../../../shared/engine/importing'
import type { DrillMusic, PlayedEvent } from '../../../shared/engine/types'

function indexOfBytes(haystack: Uint8Array, needle: number[]): number {
  outer: for (let i = 0; i + needle.length <= haystack.length; i++) {
    for (let k = 0; k < needle.length; k++) if (haystack[i + k] !== needle[k]) continue outer
    return i
  }
  return -1
}

describe('variable-length delta times in exported files', () => {
  // SMF 1.0 specification, "Variable-Length Quantities": the table of example numbers and their bytes.
  it.each([
    [0x00, [0x00]],
    [0x40, [0x40]],
    [0x7F, [0x7F]],
    [0x80, [0x81, 0x00]],
    [0x2000, [0xC0, 0x00]],
    [0x3FFF, [0xFF, 0x7F]],
    [0x4000, [0x81, 0x80, 0x00]],
    [0x100000, [0xC0, 0x80, 0x00]],
    [0x1FFFFF, [0xFF, 0xFF, 0x7F]],
    [0x200000, [0x81, 0x80, 0x80, 0x00]],
    [0x8000000, [0xC0, 0x80, 0x80, 0x00]],
    [0xFFFFFFF, [0xFF, 0xFF, 0xFF, 0x7F]],
  ])('a note %i ticks in is preceded by the bytes %j', (ticks, bytes) => {
    const drill: DrillMusic = { hand: 'right', tempoBpm: 100, notes: [{ pitch: 'C4', beat: ticks / EXPORT_PPQ, length: 1 }] }
    const file = exportDrillSmf(drill)
    // The note-on follows the track's name and program change, both at delta 0; 0x90 = note-on, channel 1.
    expect(indexOfBytes(file, [0xC0, 0x00, ...bytes, 0x90, 60, 80])).toBeGreaterThan(0)
  })
})

describe('exportAttemptSmf', () => {
  const events: PlayedEvent[] = [
    { note: 60, on: true, velocity: 70, timeMs: 0 },
    { note: 64, on: true, velocity: 90, timeMs: 251.3 },
    { note: 60, on: false, timeMs: 260 },
    { note: 64, on: true, velocity: 0, timeMs: 499.9 },
    { note: 67, on: true, velocity: 127, timeMs: 503.7 },
    { note: 67, on: false, timeMs: 1234.5 },
    { note: 72, on: true, velocity: 1, timeMs: 1500 },
    { note: 72, on: false, timeMs: 1750 },
  ]

  // Independent reader: midi-file (npm) parseMidi; SMF 1.0: ticksPerBeat in the header, tempo meta FF 51 in µs per quarter.
  it('reads back through midi-file with the same notes, velocities and times within one tick', () => {
    const bpm = 90
    const data = parseMidi(exportAttemptSmf(events, { tempoBpm: bpm }))
    expect(data.header.ticksPerBeat).toBe(960)
    const tempo = data.tracks.flat().find(e => e.type === 'setTempo')
    const usPerBeat = tempo && 'microsecondsPerBeat' in tempo ? tempo.microsecondsPerBeat : 0
    expect(Math.abs(usPerBeat - 60_000_000 / bpm)).toBeLessThanOrEqual(1)
    // Times as the reader sees them: ticks at the file's own tempo.
    const msPerTick = usPerBeat / 1000 / 960
    const seen: { note: number, on: boolean, velocity: number, ms: number }[] = []
    for (const track of data.tracks) {
      let ticks = 0
      for (const e of track) {
        ticks += e.deltaTime
        // SMF 1.0 / MIDI 1.0: a note-on with velocity 0 is a note-off.
        if (e.type === 'noteOn' || e.type === 'noteOff') {
          seen.push({ note: e.noteNumber, on: e.type === 'noteOn' && e.velocity > 0, velocity: e.velocity, ms: ticks * msPerTick })
        }
      }
    }
    const ons = seen.filter(e => e.on)
    expect(ons.map(e => [e.note, e.velocity])).toEqual([[60, 70], [64, 90], [67, 127], [72, 1]])
    const expectedOn = [0, 251.3, 503.7, 1500]
    ons.forEach((e, k) => expect(Math.abs(e.ms - expectedOn[k]!)).toBeLessThanOrEqual(msPerTick))
    const offs = seen.filter(e => !e.on)
    const expectedOff: Record<number, number> = { 60: 260, 64: 499.9, 67: 1234.5, 72: 1750 }
    expect(offs).toHaveLength(4)
    for (const off of offs) expect(Math.abs(off.ms - expectedOff[off.note]!)).toBeLessThanOrEqual(msPerTick)
  })

  it('moves a count-in note before time 0 to the start and releases held keys at the end', () => {
    const data = parseMidi(exportAttemptSmf([
      { note: 60, on: true, velocity: 50, timeMs: -100 },
      { note: 62, on: true, velocity: 50, timeMs: 400 },
    ]))
    const notes = data.tracks.flat().filter(e => e.type === 'noteOn' || e.type === 'noteOff')
    expect(notes).toHaveLength(4)
  })
})

describe('importSmf', () => {
  // Written by hand to SMF 1.0: header chunk (format 0, one track, 480 ticks per quarter), tempo
  // FF 51 (600,000 µs = 100 bpm), time signature FF 58 (3/4), key signature FF 59 (3 flats, major),
  // and a note-off given as note-on with velocity 0 (MIDI 1.0 running status convention).
  const track = [
    0x00, 0xFF, 0x51, 0x03, 0x09, 0x27, 0xC0,
    0x00, 0xFF, 0x58, 0x04, 0x03, 0x02, 0x18, 0x08,
    0x00, 0xFF, 0x59, 0x02, 0xFD, 0x00,
    0x00, 0x90, 0x3F, 0x40, // Eb4 on
    0x83, 0x60, 0x90, 0x3F, 0x00, // 480 ticks later: Eb4 "on" with velocity 0 = off
    0x00, 0x90, 0x46, 0x50, // Bb4 on
    0x81, 0x70, 0x80, 0x46, 0x00, // 240 ticks later: Bb4 off
    0x00, 0xFF, 0x2F, 0x00,
  ]
  const file = new Uint8Array([
    0x4D, 0x54, 0x68, 0x64, 0, 0, 0, 6, 0, 0, 0, 1, 0x01, 0xE0,
    0x4D, 0x54, 0x72, 0x6B, 0, 0, 0, track.length, ...track,
  ])

  it('reads notes, beats, lengths, tempo, metre and key from a hand-written file', () => {
    const drill = importSmf(file, { hand: 'left' })
    expect(drill).toEqual({
      hand: 'left',
      tempoBpm: 100,
      key: 'Eb major',
      meter: '3/4',
      title: null,
      notes: [{ pitch: 'Eb4', beat: 0, length: 1 }, { pitch: 'Bb4', beat: 1, length: 0.5 }],
    })
  })

  it('round-trips an exported both-hands drill, the higher track as the right hand', () => {
    const drill: DrillMusic = {
      hand: 'both',
      tempoBpm: 72,
      notes: [
        { pitch: 'C5', beat: 0, length: 0.5, hand: 'right' },
        { pitch: 'C3', beat: 0, length: 1, hand: 'left' },
        { pitch: 'D5', beat: 0.5, length: 0.5, hand: 'right' },
        { pitch: 'E3', beat: 1, length: 1 / 3, hand: 'left' },
      ],
    }
    const back = importSmf(exportDrillSmf(drill, 'Contrary motion'))
    expect(back.hand).toBe('both')
    expect(back.tempoBpm).toBe(72)
    expect(back.title).toBe('Contrary motion')
    const sortKey = (n: { beat: number, pitch: string }): string => `${n.beat.toFixed(4)} ${n.pitch}`
    expect(back.notes.map(n => [sortKey(n), n.hand, n.length.toFixed(3)]).sort())
      .toEqual(drill.notes.map(n => [sortKey(n), n.hand, n.length.toFixed(3)]).sort())
  })

  // SMF 1.0 format 0: one track carrying both channels (status 0x90 = channel 1, 0x91 = channel 2).
  it('splits a format-0 file by channel into two hands', () => {
    const events = [0x00, 0x90, 0x48, 0x40, 0x00, 0x91, 0x30, 0x40, 0x83, 0x60, 0x80, 0x48, 0x00, 0x00, 0x81, 0x30, 0x00, 0x00, 0xFF, 0x2F, 0x00]
    const bytes = new Uint8Array([
      0x4D, 0x54, 0x68, 0x64, 0, 0, 0, 6, 0, 0, 0, 1, 0x01, 0xE0,
      0x4D, 0x54, 0x72, 0x6B, 0, 0, 0, events.length, ...events,
    ])
    const drill = importSmf(bytes)
    expect(drill.hand).toBe('both')
    expect(drill.tempoBpm).toBe(120)
    expect(drill.notes).toEqual([
      { pitch: 'C3', beat: 0, length: 1, hand: 'left' },
      { pitch: 'C5', beat: 0, length: 1, hand: 'right' },
    ])
  })

  it('snaps a recorded performance to a grid when asked', () => {
    const recorded: DrillMusic = { hand: 'right', tempoBpm: 100, notes: [
      { pitch: 'C4', beat: 0.02, length: 0.43 },
      { pitch: 'D4', beat: 0.49, length: 0.05 },
      { pitch: 'E4', beat: 1.04, length: 0.47 },
    ] }
    const drill = importSmf(exportDrillSmf(recorded), { quantize: 0.5 })
    expect(drill.notes.map(n => [n.beat, n.length])).toEqual([[0, 0.5], [0.5, 0.5], [1, 0.5]])
    expect(() => importSmf(exportDrillSmf(recorded), { quantize: 0 })).toThrow(/quantize grid/)
  })

  it.each([
    ['random bytes', new Uint8Array([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15]), /not a MIDI file/],
    ['a truncated file', file.subarray(0, 30), /damaged/],
  ])('rejects %s with a clear error', (_, bytes, message) => {
    expect(() => importSmf(bytes)).toThrow(ImportError)
    expect(() => importSmf(bytes)).toThrow(message)
  })

  it('says so when a file has no notes', () => {
    const empty = exportAttemptSmf([])
    expect(() => importSmf(empty)).toThrow(/no notes/)
  })
})
