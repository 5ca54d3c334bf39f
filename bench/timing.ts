/**
 * The median wall time and the median CPU time (this process's own, user and system) of `repeats`
 * runs, in ms. On a shared machine the wall clock also counts the time other processes held the CPU,
 * so the CPU time is the figure nearer what a quiet machine shows (it still pays for caches the others
 * share, so it is no lower bound). Medians are steadier than means.
 */
export function medianTimes(run: () => void, repeats: number): { wallMs: number, cpuMs: number } {
  const walls: number[] = []
  const cpus: number[] = []
  for (let r = 0; r < repeats; r++) {
    const cpu = process.cpuUsage()
    const start = performance.now()
    run()
    walls.push(performance.now() - start)
    const used = process.cpuUsage(cpu)
    cpus.push((used.user + used.system) / 1000)
  }
  const median = (values: number[]): number => values.sort((a, b) => a - b)[Math.floor(values.length / 2)]!
  return { wallMs: median(walls), cpuMs: median(cpus) }
}

/** The median wall time of `repeats` runs, in ms. */
export function medianMs(run: () => void, repeats: number): number {
  return medianTimes(run, repeats).wallMs
}
