import { describe, expect, it } from 'vitest'
import { keyboardRange, stepsOf, tightRange } from '~/composables/usePracticeSession'

describe('the keys the practice page draws', () => {
  it('spans whole octaves from C around the drill on a wide screen', () => {
    expect(keyboardRange([60, 62, 64, 65, 67])).toEqual({ low: 48, high: 72 })
  })

  it('draws only the notes and a white key either side on a phone held upright, never ending on a black key', () => {
    // C4–G4: B3 below and A4 above; a drill up to G♯4 ends on A4, one starting on C♯4 starts on C4.
    expect(tightRange([60, 62, 64, 65, 67])).toEqual({ low: 59, high: 69 })
    expect(tightRange([61, 68])).toEqual({ low: 60, high: 69 })
    expect(tightRange([21, 108])).toEqual({ low: 21, high: 108 })
  })

  it('makes notes that start together one step, in order of their beat', () => {
    expect(stepsOf([
      { pitch: 'E4', beat: 1, length: 1 },
      { pitch: 'C4', beat: 0, length: 1 },
      { pitch: 'C3', beat: 0, length: 1 },
    ])).toEqual([[1, 2], [0]])
  })
})
