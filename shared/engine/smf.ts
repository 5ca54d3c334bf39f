// Standard MIDI Files in and out, through @tonejs/midi (which reads and writes the bytes with
// midi-file, including the variable-length delta times).
//
// In: every track with notes becomes a voice (@tonejs/midi splits a format-0 file by channel);
// one voice is one hand, two are both hands (the higher one on average is the right hand).
// Out: 960 ticks per quarter note, which keeps an attempt's millisecond times within one tick
// at any tempo up to 62 beats per second.
// The package's main file is a bundle whose named exports Node's ESM loader cannot see (the command
// line and the seed run the engine under Node); its CommonJS build file exports `Midi` by name.
import { Midi } from '@tonejs/midi/dist/Midi.js'
import { ImportError, drillTempo, finishImport, roundBeat, DEFAULT_TEMPO_BPM } from './importing'
import { drillNoteHands } from './hands'
import { pairNoteEvents } from './performance'
import { midiFromName, nameFromMidi, spellingForKey, type Spelling } from './pitch'
import type { DrillMusic, DrillNote, Hand, ImportedDrill, PlayedEvent } from './types'

export const EXPORT_PPQ = 960
/** General MIDI percussion is channel 10 (index 9); drum notes are not a drill. */
const PERCUSSION_CHANNEL = 9
/** Loudness of a drill's notes when exported: mezzo-forte, as the MIDI specification suggests for keyboards without velocity (64) and a touch over. */
const DRILL_VELOCITY = 80
/** Velocity written for played notes that carried none (on-screen keys). */
const NEUTRAL_VELOCITY = 64

export interface SmfImportOptions {
  /** The hand of a one-voice file; right when absent. */
  hand?: Hand
  /** Which tracks to read (indices into the tracks that hold notes), when a file has more than two. */
  tracks?: number[]
  /**
   * Snap onsets and lengths to this grid in beats (0.25 for semiquavers), for files recorded
   * from a keyboard rather than written in a sequencer; no snapping when absent.
   */
  quantize?: number
}

function parse(bytes: Uint8Array): Midi {
  if (bytes.length < 14 || String.fromCharCode(...bytes.subarray(0, 4)) !== 'MThd') {
    throw new ImportError('This is not a Standard MIDI File: it does not begin with an MThd header')
  }
  try {
    return new Midi(bytes)
  }
  catch (error) {
    throw new ImportError(`This MIDI file is damaged and cannot be read (${error instanceof Error ? error.message : String(error)})`)
  }
}

export function importSmf(bytes: Uint8Array, options: SmfImportOptions = {}): ImportedDrill {
  const midi = parse(bytes)
  const voiced = midi.tracks.filter(t => t.notes.length > 0 && t.channel !== PERCUSSION_CHANNEL)
  let chosen = voiced
  if (options.tracks) {
    chosen = options.tracks.map((k) => {
      const track = voiced[k]
      if (!track) throw new ImportError(`Track ${k} does not exist: the file has ${voiced.length} tracks with notes (0 to ${voiced.length - 1})`)
      return track
    })
  }
  if (chosen.length > 2) {
    throw new ImportError(`The MIDI file has ${chosen.length} tracks with notes; choose one or two of them (0 to ${chosen.length - 1})`)
  }

  const keySignature = midi.header.keySignatures[0]
  const key = keySignature ? `${keySignature.key} ${keySignature.scale}` : null
  const spelling: Spelling = key ? spellingForKey(key) : 'sharps'
  const ppq = midi.header.ppq
  const meanPitch = (k: number): number => chosen[k]!.notes.reduce((s, n) => s + n.midi, 0) / chosen[k]!.notes.length
  const hands: Hand[] = chosen.length === 2
    ? (meanPitch(0) >= meanPitch(1) ? ['right', 'left'] : ['left', 'right'])
    : [options.hand ?? 'right']

  const grid = options.quantize
  if (grid !== undefined && !(grid > 0 && grid <= 4)) throw new ImportError(`A quantize grid of ${grid} beats is not usable: choose more than 0 and at most 4`)
  const snap = (beats: number): number => roundBeat(grid ? Math.round(beats / grid) * grid : beats)
  const notes: DrillNote[] = chosen.flatMap((track, k) => track.notes.map(n => ({
    pitch: nameFromMidi(n.midi, spelling),
    beat: snap(n.ticks / ppq),
    // A zero-length note (on and off on one tick) still sounds: give it one tick, or one grid step.
    length: Math.max(snap(Math.max(n.durationTicks, 1) / ppq), grid ?? 0, 1 / ppq),
    ...(chosen.length === 2 ? { hand: hands[k]! } : {}),
  })))
  const signature = midi.header.timeSignatures[0]?.timeSignature
  return finishImport({
    hand: chosen.length === 2 ? 'both' : hands[0]!,
    tempoBpm: drillTempo(midi.header.tempos[0]?.bpm),
    notes,
    key,
    meter: signature ? `${signature[0]}/${signature[1]}` : null,
    title: midi.name.trim() || null,
    kind: 'MIDI file',
  })
}

function newMidi(name: string, bpm: number): Midi {
  const midi = new Midi()
  // The header's ppq has no setter; fromJSON is the library's way to choose the resolution.
  midi.header.fromJSON({ name, ppq: EXPORT_PPQ, tempos: [{ bpm, ticks: 0 }], timeSignatures: [], keySignatures: [], meta: [] })
  return midi
}

/** A drill as a MIDI file: one track per hand (right on channel 1, left on channel 2), at the drill's tempo. */
export function exportDrillSmf(drill: DrillMusic, title = 'Evenhand drill'): Uint8Array {
  const midi = newMidi(title, drill.tempoBpm)
  const tracks: Hand[] = drill.hand === 'both' ? ['right', 'left'] : [drill.hand]
  const noteHands = drillNoteHands(drill)
  tracks.forEach((hand, channel) => {
    const track = midi.addTrack()
    track.name = `${hand} hand`
    track.channel = channel
    const own = drill.notes.map((n, i) => ({ n, i, midi: midiFromName(n.pitch) })).filter(({ i }) => noteHands[i] === hand)
    for (const { n, midi } of own.sort((a, b) => a.n.beat - b.n.beat)) {
      track.addNote({
        midi,
        ticks: Math.round(n.beat * EXPORT_PPQ),
        durationTicks: Math.max(1, Math.round(n.length * EXPORT_PPQ)),
        velocity: DRILL_VELOCITY / 127,
      })
    }
  })
  return midi.toArray()
}

export interface AttemptExportOptions {
  /** The tempo written into the file, so a sequencer's bars line up with the drill; 120 when absent. */
  tempoBpm?: number
  title?: string
}

/**
 * A played attempt as a MIDI file, times converted from ms at the given tempo. Events before
 * time 0 (a note struck during the count-in) move the whole attempt later by that much, since
 * a MIDI file cannot start before its beginning. A key still held at the end is released at
 * the attempt's last event.
 */
export function exportAttemptSmf(events: PlayedEvent[], options: AttemptExportOptions = {}): Uint8Array {
  const bpm = options.tempoBpm ?? DEFAULT_TEMPO_BPM
  const midi = newMidi(options.title ?? 'Evenhand attempt', bpm)
  const track = midi.addTrack()
  track.name = 'attempt'
  const notes = pairNoteEvents(events)
  let origin = 0
  let end = 0
  for (const e of events) {
    if (!Number.isFinite(e.timeMs)) continue
    origin = Math.min(origin, e.timeMs)
    end = Math.max(end, e.timeMs)
  }
  const ticks = (ms: number): number => Math.round(((ms - origin) * bpm * EXPORT_PPQ) / 60_000)
  for (const n of notes) {
    const on = ticks(n.onMs)
    track.addNote({
      midi: n.midi,
      ticks: on,
      durationTicks: Math.max(1, ticks(n.offMs ?? end) - on),
      velocity: (n.velocity ?? NEUTRAL_VELOCITY) / 127,
    })
  }
  return midi.toArray()
}
