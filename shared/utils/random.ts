// Repeatable randomness for invented performances: the demo studio's past attempts (seeds/demo) and
// the simulated player the engine's inference is measured against (tests/unit/engine/support), so a
// seed run builds the same studio and a test run plays the same performances every time.

/** A seeded generator (mulberry32): numbers in [0, 1), the same sequence for the same seed. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6D2B79F5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

/** A standard normal draw (Box–Muller), taking two numbers from `random`. */
export function gaussian(random: () => number): number {
  return Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random())
}
