// How well the inference hears the fingering in the timing: the simulated player's performances
// (tests/unit/engine/support/player.ts) and the share of them the inference recovers.
import { inferFingering } from '../shared/engine'
import { formatRecovery, measureRecovery } from '../tests/unit/engine/support/recovery'

export function benchRecovery(): void {
  const recovery = measureRecovery((hand, notes) => inferFingering(hand, notes))
  console.log('inference recovery over simulated performances (both hands, legato and détaché, 3 seeds each; "decisive": the timing tells every position change)')
  for (const line of formatRecovery(recovery)) console.log(line)
}
