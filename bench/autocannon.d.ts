// The part of autocannon 9's API that bench/load.ts uses (the package ships no types).
declare module 'autocannon' {
  interface Request { method?: string, path?: string, headers?: Record<string, string>, body?: string }
  interface Options {
    url: string
    connections?: number
    duration?: number
    requests?: (Request & { setupRequest?: (req: Request) => Request })[]
  }
  interface Histogram { p50: number, p99: number, average: number }
  interface Result {
    latency: Histogram
    requests: Histogram
    errors: number
    timeouts: number
    non2xx: number
    statusCodeStats: Record<string, { count: number }>
  }
  function autocannon(options: Options): Promise<Result>
  export default autocannon
}
