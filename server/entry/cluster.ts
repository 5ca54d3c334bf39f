// The built server's entry (nuxt.config.ts, `nitro.entry`): one worker per core sharing one port, as Nitro's
// node-cluster preset starts them, since a single Node process saving attempts kept one core busy while the
// other waited (DEVELOPERS.md, "Load test"). Unlike the preset, a signal to the primary reaches every worker,
// so a stop takes as long as their own graceful shutdown instead of the preset's 30 s wait for workers nobody
// told to stop; and a worker that dies while starting (a port taken, a bad setting) stops the whole server
// with its exit code instead of being started again forever. The app keeps no state of its own (README, "Scaling").
import cluster from 'node:cluster'
import { availableParallelism } from 'node:os'

/** A worker that ends sooner than this after its start is taken to fail at start-up. */
const START_MS = 10_000

/**
 * V8's young generation per worker, in MB for each of its two halves (Node's own default is 16). A save
 * allocates an attempt's JSON several times over (the body, its parse, the grade, the row, the answer),
 * and a larger nursery lets most of it die there instead of being copied on: the load test's workers
 * spent 2.9 ms of CPU per save where they spent 3.1 (DEVELOPERS.md, "Load test"). A flag given to the
 * server's own command line wins.
 */
const SEMI_SPACE_MB = 64

function alive(): NonNullable<typeof cluster.workers>[string][] {
  return Object.values(cluster.workers ?? {}).filter(w => w && !w.isDead())
}

if (cluster.isPrimary) {
  const count = Number.parseInt(process.env.NITRO_CLUSTER_WORKERS ?? '', 10) || availableParallelism()
  const startedAt = new Map<number, number>()
  let stopping = false
  const fork = (): void => {
    const worker = cluster.fork()
    startedAt.set(worker.id, Date.now())
  }
  const stop = (signal: NodeJS.Signals): void => {
    stopping = true
    for (const worker of alive()) worker!.process.kill(signal)
    if (!alive().length) process.exit()
  }
  cluster.on('exit', (worker, code) => {
    if (!stopping && Date.now() - (startedAt.get(worker.id) ?? 0) < START_MS) {
      process.exitCode = code || 1
      stop('SIGTERM')
    }
    if (stopping) {
      if (!alive().length) process.exit()
      return
    }
    fork()
  })
  for (const signal of ['SIGTERM', 'SIGINT'] as const) process.on(signal, () => stop(signal))
  if (!process.execArgv.some(arg => arg.startsWith('--max-semi-space-size'))) {
    cluster.setupPrimary({ execArgv: [...process.execArgv, `--max-semi-space-size=${SEMI_SPACE_MB}`] })
  }
  for (let i = 0; i < count; i++) fork()
}
else {
  import('nitropack/presets/node/runtime/node-server').catch((error: unknown) => {
    console.error(error)
    process.exit(1)
  })
}
