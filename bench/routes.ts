// Timing a route from the test stack's server over loopback: sequential requests after a warm-up,
// p50 and p95 printed (each figure is the server's time plus well under a millisecond of HTTP here).
import type { Client } from '../tests/support/server'

export const ROUTE_RUNS = 200
export const ROUTE_WARM_UP = 20

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)]!
}

export async function timeRoute(client: Client, path: string): Promise<void> {
  for (let k = 0; k < ROUTE_WARM_UP; k++) await client.get(path)
  const ms: number[] = []
  for (let k = 0; k < ROUTE_RUNS; k++) {
    const t = performance.now()
    const res = await client.get(path)
    ms.push(performance.now() - t)
    if (res.status !== 200) throw new Error(`${path}: ${res.status}`)
  }
  ms.sort((a, b) => a - b)
  console.log(`  ${path.padEnd(58)} p50 ${percentile(ms, 50).toFixed(1)} ms  p95 ${percentile(ms, 95).toFixed(1)} ms  (goal p95 < 50 ms)`)
}
