import { expect, it } from 'vitest'
import { PitchName } from '../../shared/types/drill'

it('accepts spelled pitches', () => {
  expect(PitchName.safeParse('F##4').success).toBe(true)
  expect(PitchName.safeParse('H4').success).toBe(false)
})
