import { describe, expect, it } from 'vitest'
import { inferFingering, type PerformedNote } from '../../../shared/engine/infer'

const C_MAJOR_OCTAVE = [60, 62, 64, 65, 67, 69, 71, 72]
const STEP_MS = 300

/** Every note held until just after the next begins (legato), optionally with a hand lift before one note. */
function played(midis: number[], liftBefore: number | null = null, liftMs = 90): PerformedNote[] {
  return midis.map((midi, i) => {
    const delay = liftBefore !== null && i >= liftBefore ? liftMs : 0
    const lifted = liftBefore !== null && i === liftBefore - 1
    return { midi, onMs: i * STEP_MS + delay, offMs: lifted ? i * STEP_MS + 180 : (i + 1) * STEP_MS + 20 + delay, velocity: 70 }
  })
}

describe('inferFingering', () => {
  it('infers the textbook fingering of a legato C major octave', () => {
    const result = inferFingering('right', played(C_MAJOR_OCTAVE))
    expect(result.fingers.map(f => f.finger)).toEqual([1, 2, 3, 1, 2, 3, 4, 5])
    expect(result.positions).toEqual([3])
  })

  it('moves the position change to where the hand lifted', () => {
    const legato = inferFingering('right', played(C_MAJOR_OCTAVE))
    const lifted = inferFingering('right', played(C_MAJOR_OCTAVE, 5))
    expect(lifted.positions).toContain(5)
    expect(lifted.positions).not.toEqual(legato.positions)
    expect(lifted.fingers.map(f => f.finger)).not.toEqual(legato.fingers.map(f => f.finger))
  })

  it('rules out the same finger on two keys that overlap', () => {
    // A leap of a ninth up and back: legato between the two keys needs two fingers.
    const notes = played([60, 74, 60, 74])
    for (let i = 1; i < notes.length; i++) {
      const { fingers } = inferFingering('right', notes)
      expect(fingers[i]!.finger).not.toBe(fingers[i - 1]!.finger)
    }
  })

  it('lets a long silence allow the same finger on two keys', () => {
    // Two octaves apart, beyond any legato reach: detached and late, the hand simply moved.
    const detached: PerformedNote[] = [
      { midi: 60, onMs: 0, offMs: 200, velocity: 70 },
      { midi: 62, onMs: 300, offMs: 520, velocity: 70 },
      { midi: 86, onMs: 900, offMs: 1100, velocity: 70 },
      { midi: 88, onMs: 1200, offMs: 1420, velocity: 70 },
    ]
    const result = inferFingering('right', detached)
    expect(result.positions).toEqual([2])
  })

  it('groups notes struck together into a chord with ordered fingers', () => {
    const chord: PerformedNote[] = [
      { midi: 67, onMs: 0, offMs: 500, velocity: 70 },
      { midi: 60, onMs: 10, offMs: 500, velocity: 70 },
      { midi: 64, onMs: 20, offMs: 500, velocity: 70 },
    ]
    const fingers = inferFingering('right', chord).fingers.map(f => f.finger)
    expect(fingers).toEqual([5, 1, 3])
  })

  it('reads a loud note as a likely thumb', () => {
    // D E D E ... could be 1 2, 2 3 or 3 4; loud Ds make the thumb on D more probable.
    const base: PerformedNote[] = [62, 64, 62, 64, 62, 64].map((midi, i) => ({ midi, onMs: i * STEP_MS, offMs: (i + 1) * STEP_MS + 20, velocity: 60 }))
    const accented = base.map(n => (n.midi === 62 ? { ...n, velocity: 95 } : n))
    const even = inferFingering('right', base).fingers[0]!
    const heavy = inferFingering('right', accented).fingers[0]!
    expect(even).toMatchObject({ finger: 1 })
    expect(heavy.finger).toBe(1)
    expect(heavy.confidence).toBeGreaterThan(even.confidence + 0.1)
  })

  it('copes without release times', () => {
    const notes = played(C_MAJOR_OCTAVE).map(n => ({ ...n, offMs: null }))
    const result = inferFingering('left', notes)
    expect(result.fingers).toHaveLength(notes.length)
    for (const f of result.fingers) expect(f.confidence).toBeGreaterThanOrEqual(0)
  })

  it('returns nothing for nothing', () => {
    expect(inferFingering('right', [])).toEqual({ fingers: [], positions: [] })
  })
})
