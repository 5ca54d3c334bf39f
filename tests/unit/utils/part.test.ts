import { describe, expect, it } from 'vitest'
import { parseNotation } from '../../../shared/engine'
import type { DrillMusic } from '../../../shared/types/drill'
import { barCount, beatsPerBar, drillPart } from '../../../shared/utils/part'

// Two bars of 3/4, both hands: the right hand plays crotchets, then a crotchet and a minim; the left a dotted minim
// each bar. The left hand is written first, so a note's index among the drill's notes differs from its index in its hand.
const music: DrillMusic = {
  hand: 'both',
  tempoBpm: 90,
  notes: parseNotation('LH C3/5:3 | G2/1\nRH C5/1 D5/2 E5/3 | F5/4 G5/5:2', { hand: 'both', beatsPerBar: 3 }),
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
    expect(part.indexes).toEqual([5, 6])
    expect(part.others.map(n => [n.pitch, n.beat])).toEqual([['G2', 0]])
  })

  it('keeps both hands when no hand is named, and the whole drill without a part', () => {
    expect(drillPart(music, { fromBar: 1, toBar: 1, hand: null }, 3)!.indexes).toEqual([0, 2, 3, 4])
    expect(drillPart(music, null, 3)!.music).toBe(music)
  })

  it('finds nothing to play in bars past the end', () => {
    expect(drillPart(music, { fromBar: 3, toBar: 4, hand: null }, 3)).toBeNull()
  })
})
