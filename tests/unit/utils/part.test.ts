import { describe, expect, it } from 'vitest'
import type { DrillMusic } from '../../../shared/types/drill'
import { barCount, beatsPerBar, drillPart } from '../../../shared/utils/part'

// Two bars of 3/4, both hands: the right hand plays crotchets, the left a dotted minim each bar.
const music: DrillMusic = {
  hand: 'both',
  tempoBpm: 90,
  notes: [
    { pitch: 'C5', beat: 0, length: 1, hand: 'right', finger: 1 },
    { pitch: 'C3', beat: 0, length: 3, hand: 'left', finger: 5 },
    { pitch: 'D5', beat: 1, length: 1, hand: 'right', finger: 2 },
    { pitch: 'E5', beat: 2, length: 1, hand: 'right', finger: 3 },
    { pitch: 'F5', beat: 3, length: 1, hand: 'right', finger: 4 },
    { pitch: 'G2', beat: 3, length: 3, hand: 'left', finger: 1 },
    { pitch: 'G5', beat: 4, length: 2, hand: 'right', finger: 5 },
  ],
}

describe('a part of a drill', () => {
  it('reads the beats in a bar from the metre, four when it does not say', () => {
    expect(beatsPerBar('3/4')).toBe(3)
    expect(beatsPerBar('6/8')).toBe(6)
    expect(beatsPerBar('')).toBe(4)
    expect(barCount(music.notes, 3)).toBe(2)
  })

  it('takes the second bar for the right hand, from beat 0, with the left hand beside it', () => {
    const part = drillPart(music, { fromBar: 2, toBar: 2, hand: 'right' }, 3)!
    expect(part.music.hand).toBe('right')
    expect(part.music.notes.map(n => [n.pitch, n.beat])).toEqual([['F5', 0], ['G5', 1]])
    expect(part.indexes).toEqual([4, 6])
    expect(part.others.map(n => [n.pitch, n.beat])).toEqual([['G2', 0]])
  })

  it('keeps both hands when no hand is named, and the whole drill without a part', () => {
    expect(drillPart(music, { fromBar: 1, toBar: 1, hand: null }, 3)!.indexes).toEqual([0, 1, 2, 3])
    expect(drillPart(music, null, 3)!.music).toBe(music)
  })

  it('finds nothing to play in bars past the end', () => {
    expect(drillPart(music, { fromBar: 3, toBar: 4, hand: null }, 3)).toBeNull()
  })
})
