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
  /** Which tracks to read, numbered from 1 among the tracks that hold notes (as `smfTracks` lists them). */
  tracks?: number[]
  /**
   * Snap onsets and lengths to this grid in beats (0.25 for semiquavers), for files recorded
   * from a keyboard rather than written in a sequencer; no snapping when absent.
   */
  quantize?: number
}

/** A track as the preview lists it, so the teacher can choose one. */
export interface SmfTrack {
  number: number
  name: string
  noteCount: number
  channel: number
}

const chunkId = (bytes: Uint8Array, at: number): string => String.fromCharCode(...bytes.subarray(at, at + 4))
const uint32 = (bytes: Uint8Array, at: number): number => ((bytes[at]! << 24) >>> 0) + (bytes[at + 1]! << 16) + (bytes[at + 2]! << 8) + bytes[at + 3]!

/**
 * The chunk structure of SMF 1.0 checked before any event is read: an MThd of at least 6 bytes,
 * then as many chunks as the header promises, none longer than what the file still holds. The
 * reader underneath stops quietly at the end of the bytes, so a truncated file or one claiming
 * more tracks than it holds would otherwise come through half read.
 */
function checkChunks(bytes: Uint8Array): void {
  const headerLength = uint32(bytes, 4)
  if (headerLength < 6 || 8 + headerLength > bytes.length) throw new ImportError(`this MIDI file is damaged: its MThd header claims ${headerLength} bytes`)
  const promised = (bytes[10]! << 8) + bytes[11]!
  let at = 8 + headerLength
  let tracks = 0
  while (at < bytes.length) {
    if (at + 8 > bytes.length) throw new ImportError(`this MIDI file is damaged: it ends inside a chunk header at byte ${at}`)
    const length = uint32(bytes, at + 4)
    if (at + 8 + length > bytes.length) {
      throw new ImportError(`this MIDI file is truncated or damaged: chunk ${tracks + 1} claims ${length} bytes but only ${bytes.length - at - 8} remain`)
    }
    if (chunkId(bytes, at) === 'MTrk') tracks++
    at += 8 + length
  }
  if (tracks !== promised) throw new ImportError(`this MIDI file is damaged: its header promises ${promised} tracks but it holds ${tracks}`)
}

function parse(bytes: Uint8Array): Midi {
  if (bytes.length < 14 || chunkId(bytes, 0) !== 'MThd') {
    throw new ImportError('not a MIDI file: a Standard MIDI File begins with an MThd header')
  }
  checkChunks(bytes)
  try {
    return new Midi(bytes)
  }
  catch (error) {
    throw new ImportError(`this MIDI file is damaged and cannot be read (${error instanceof Error ? error.message : String(error)})`)
  }
}

const voicedTracks = (midi: Midi): Midi['tracks'] => midi.tracks.filter(t => t.notes.length > 0 && t.channel !== PERCUSSION_CHANNEL)

/** A parsed Standard MIDI File, read once and then listed or imported. */
export interface SmfDocument {
  midi: Midi
}

export function parseSmf(bytes: Uint8Array): SmfDocument {
  return { midi: parse(bytes) }
}

/** The tracks that hold notes, numbered from 1, as `importSmf`'s `tracks` counts them. */
export function smfTracks(doc: SmfDocument): SmfTrack[] {
  return voicedTracks(doc.midi).map((t, k) => ({ number: k + 1, name: t.name.trim() || t.instrument.name || `Track ${k + 1}`, noteCount: t.notes.length, channel: t.channel + 1 }))
}

export function importSmf(source: Uint8Array | SmfDocument, options: SmfImportOptions = {}): ImportedDrill {
  const midi = source instanceof Uint8Array ? parse(source) : source.midi
  const voiced = voicedTracks(midi)
  let chosen = voiced
  if (options.tracks) {
    chosen = options.tracks.map((k) => {
      const track = voiced[k - 1]
      if (!track) throw new ImportError(`track ${k} does not exist: the file has ${voiced.length} track${voiced.length === 1 ? '' : 's'} with notes (1 to ${voiced.length})`)
      return track
    })
  }
  if (chosen.length > 2) {
    throw new ImportError(`the MIDI file has ${chosen.length} tracks with notes; choose one or two of them (1 to ${chosen.length})`)
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
