import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { alignNotes, type AlignPlayed, type AlignTarget } from '../../../shared/engine/align'

const line = (midis: number[]): AlignTarget[] => midis.map((midi, beat) => ({ midi, beat }))
const play = (midis: number[], stepMs = 300): AlignPlayed[] => midis.map((midi, i) => ({ midi, onMs: i * stepMs }))
const SCALE = [60, 62, 64, 65, 67, 69, 71, 72]

describe('alignNotes', () => {
  it('matches a clean performance note for note', () => {
    const a = alignNotes(line(SCALE), play(SCALE))
    expect(a.counts).toEqual({ correct: 8, wrong: 0, extra: 0, missed: 0 })
    expect(a.match).toEqual([0, 1, 2, 3, 4, 5, 6, 7])
  })

  it('counts a wrong note in place of a drill note', () => {
    const a = alignNotes(line(SCALE), play([60, 62, 63, 65, 67, 69, 71, 72]))
    expect(a.counts).toEqual({ correct: 7, wrong: 1, extra: 0, missed: 0 })
    expect(a.outcome[2]).toBe('wrong')
    expect(a.match[2]).toBe(2)
  })

  it('counts a missed note without shifting the rest', () => {
    const a = alignNotes(line(SCALE), play([60, 62, 65, 67, 69, 71, 72]))
    expect(a.counts).toEqual({ correct: 7, wrong: 0, extra: 0, missed: 1 })
    expect(a.outcome[2]).toBe('missed')
    expect(a.match[3]).toBe(2)
  })

  it('counts an extra note and names it', () => {
    const a = alignNotes(line(SCALE), play([60, 62, 61, 64, 65, 67, 69, 71, 72]))
    expect(a.counts).toEqual({ correct: 8, wrong: 0, extra: 1, missed: 0 })
    expect(a.extras).toEqual([2])
  })

  it('lets the notes of a chord arrive in any order', () => {
    const targets: AlignTarget[] = [{ midi: 60, beat: 0 }, { midi: 64, beat: 0 }, { midi: 67, beat: 0 }, { midi: 72, beat: 1 }]
    const played: AlignPlayed[] = [{ midi: 67, onMs: 0 }, { midi: 60, onMs: 8 }, { midi: 64, onMs: 15 }, { midi: 72, onMs: 500 }]
    const a = alignNotes(targets, played)
    expect(a.counts.correct).toBe(4)
    expect(a.match).toEqual([1, 2, 0, 3])
  })

  it('keeps order outside chords: a swapped pair is not two correct notes', () => {
    const a = alignNotes(line([60, 62, 64]), play([60, 64, 62]))
    expect(a.counts.correct).toBe(2)
  })

  it('forgives a rushed note that lands within the chord window of the one before', () => {
    const played: AlignPlayed[] = [{ midi: 64, onMs: 0 }, { midi: 62, onMs: 300 }, { midi: 60, onMs: 320 }, { midi: 59, onMs: 900 }]
    const a = alignNotes(line([64, 62, 60, 59]), played)
    expect(a.counts).toEqual({ correct: 4, wrong: 0, extra: 0, missed: 0 })
    expect(a.match).toEqual([0, 1, 2, 3])
  })

  it('lets the hands of a both-hands beat arrive up to 100 ms apart in either order', () => {
    // Drill: C3 + C5 on beat 0, D3 + D5 on beat 1; the right hand leads by 60 ms on beat 0.
    const targets: AlignTarget[] = [{ midi: 48, beat: 0 }, { midi: 72, beat: 0 }, { midi: 50, beat: 1 }, { midi: 74, beat: 1 }]
    const played: AlignPlayed[] = [{ midi: 72, onMs: 0 }, { midi: 48, onMs: 60 }, { midi: 50, onMs: 600 }, { midi: 74, onMs: 640 }]
    expect(alignNotes(targets, played).counts.correct).toBe(4)
    const late: AlignPlayed[] = [{ midi: 72, onMs: 0 }, { midi: 48, onMs: 250 }, { midi: 50, onMs: 600 }, { midi: 74, onMs: 640 }]
    expect(alignNotes(targets, late).counts.correct).toBe(3)
  })

  it('uses the intervals, given a tempo, to find which repeated key was missed', () => {
    const targets = line([67, 67, 67, 67, 67, 67])
    const played = [0, 600, 1800, 2400, 3000].map(onMs => ({ midi: 67, onMs }))
    expect(alignNotes(targets, played, { msPerBeat: 600, toleranceMs: 600 }).outcome).toEqual(['correct', 'correct', 'missed', 'correct', 'correct', 'correct'])
    // A rough tempo is enough: the long gap still stands out.
    expect(alignNotes(targets, played, { msPerBeat: 780, toleranceMs: 780 }).outcome[2]).toBe('missed')
  })

  it('finds the whole drill after a false start', () => {
    const played = play([...SCALE.slice(0, 3), ...SCALE])
    const a = alignNotes(line(SCALE), played)
    expect(a.counts).toEqual({ correct: 8, wrong: 0, extra: 3, missed: 0 })
  })

  it('handles empty sides', () => {
    expect(alignNotes([], play([60])).counts).toEqual({ correct: 0, wrong: 0, extra: 1, missed: 0 })
    expect(alignNotes(line([60, 62]), []).counts).toEqual({ correct: 0, wrong: 0, extra: 0, missed: 2 })
    expect(alignNotes([], []).counts).toEqual({ correct: 0, wrong: 0, extra: 0, missed: 0 })
  })

  it('aligns without a tempo exactly as the two-layer pass does when intervals cost nothing', () => {
    // An infinite tolerance prices every interval at 0, so the timed programme sees pitch and order
    // only; the untimed pass keeps one cost per cell instead of two and must choose the same path.
    const note = fc.record({ midi: fc.integer({ min: 58, max: 62 }), step: fc.constantFrom(0, 0.5, 1) })
    const hit = fc.record({ midi: fc.integer({ min: 58, max: 62 }), gapMs: fc.integer({ min: 0, max: 700 }) })
    fc.assert(fc.property(fc.array(note, { maxLength: 60 }), fc.array(hit, { maxLength: 70 }), (ns, hs) => {
      let beat = 0
      const targets = ns.map(n => ({ midi: n.midi, beat: (beat += n.step) }))
      let onMs = 0
      const played = hs.map(h => ({ midi: h.midi, onMs: (onMs += h.gapMs) }))
      expect(alignNotes(targets, played)).toEqual(alignNotes(targets, played, { msPerBeat: 500, toleranceMs: Infinity }))
    }))
  })

  it('accounts for every note on both sides', () => {
    const midis = fc.array(fc.integer({ min: 55, max: 70 }), { maxLength: 80 })
    fc.assert(fc.property(midis, midis, (t, p) => {
      const a = alignNotes(line(t), play(p, 50))
      expect(a.counts.correct + a.counts.wrong + a.counts.missed).toBe(t.length)
      expect(a.counts.correct + a.counts.wrong + a.counts.extra).toBe(p.length)
      const used = a.match.filter(x => x !== null)
      expect(new Set([...used, ...a.extras]).size).toBe(p.length)
    }))
  })
})
