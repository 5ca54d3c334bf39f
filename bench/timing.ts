/** The median wall time of `repeats` runs, in ms: steadier than the mean on a shared machine. */
export function medianMs(run: () => void, repeats: number): number {
  const times: number[] = []
  for (let r = 0; r < repeats; r++) {
    const start = performance.now()
    run()
    times.push(performance.now() - start)
  }
  return times.sort((a, b) => a - b)[Math.floor(times.length / 2)]!
}
