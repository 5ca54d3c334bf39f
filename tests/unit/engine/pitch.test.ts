import { describe, expect, it } from 'vitest'
import { frequency, isBlackKey, keyCenterMm, midiFromName, nameFromMidi, normalizeName, PitchError, spellingForKey, toMidi } from '../../../shared/engine/pitch'

describe('pitch names and MIDI numbers', () => {
  // MIDI 1.0 specification, note numbers: 60 is middle C (C4 in scientific pitch notation).
  it('reads middle C as 60', () => {
    expect(midiFromName('C4')).toBe(60)
  })

  // Scientific pitch notation: the octave number belongs to the letter, so Cb5 = B4 and B#3 = C4 (common practice).
  it.each([
    ['F##4', 67],
    ['Cb5', 71],
    ['Bb3', 58],
    ['B#3', 60],
    ['c#4', 61],
    ['Ebb4', 62],
    ['C-1', 0],
    ['G9', 127],
    ['A4', 69],
  ])('%s is MIDI %i', (name, midi) => {
    expect(midiFromName(name)).toBe(midi)
  })

  it.each(['H4', 'C', 'C#b4', 'C###4', 'C10', '', 'Cb-1', 'G#9', 'A9'])('rejects %j with a clear error', (name) => {
    expect(() => midiFromName(name)).toThrow(PitchError)
  })

  it('accepts MIDI numbers and rejects numbers outside 0–127', () => {
    expect(toMidi(64)).toBe(64)
    expect(toMidi('E4')).toBe(64)
    expect(() => toMidi(128)).toThrow(/MIDI note number/)
    expect(() => toMidi(60.5)).toThrow(/MIDI note number/)
  })

  it('normalizes the letter to upper case', () => {
    expect(normalizeName(' bb3 ')).toBe('Bb3')
  })
})

describe('names in a key', () => {
  // Key signatures: F, Bb, Eb major and D minor use flats; G, D major and E minor sharps (common practice).
  it.each([
    ['F', 'flats'],
    ['Bb major', 'flats'],
    ['Eb', 'flats'],
    ['d minor', 'flats'],
    ['Dm', 'flats'],
    ['G', 'sharps'],
    ['E minor', 'sharps'],
    ['C', 'sharps'],
  ])('%s is written with %s', (key, spelling) => {
    expect(spellingForKey(key)).toBe(spelling)
  })

  it('spells black keys to suit the key', () => {
    expect(nameFromMidi(70)).toBe('A#4')
    expect(nameFromMidi(70, 'flats')).toBe('Bb4')
    expect(nameFromMidi(70, { key: 'F' })).toBe('Bb4')
    expect(nameFromMidi(66, { key: 'D major' })).toBe('F#4')
    expect(nameFromMidi(60, { key: 'Eb' })).toBe('C4')
  })

  it('rejects a key it cannot read', () => {
    expect(() => spellingForKey('Q major')).toThrow(PitchError)
  })
})

describe('frequency and keys', () => {
  // MIDI 1.0 specification / ISO 16: A4 = 440 Hz is note 69.
  it('gives A4 = 440 Hz for note 69', () => {
    expect(frequency(69)).toBe(440)
    expect(frequency('A4')).toBe(440)
  })

  // Equal temperament: one octave doubles the frequency; middle C ≈ 261.63 Hz (common practice).
  it('gives middle C about 261.63 Hz', () => {
    expect(frequency('C4')).toBeCloseTo(261.6256, 3)
    expect(frequency('A5')).toBeCloseTo(880, 9)
  })

  it('re-exports the key geometry', () => {
    expect(isBlackKey(midiFromName('F#4'))).toBe(true)
    expect(keyCenterMm(61) - keyCenterMm(60)).toBeGreaterThan(0)
  })
})
