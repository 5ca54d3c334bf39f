// Measures how long a key press takes to show on screen: from a MIDI message's own time stamp
// to the frame that paints the key's highlight.
//   const probe = useLatencyProbe({ presses: 20 })
//   midi.onNote(e => { if (e.on) { pressed.add(e.note); probe.measure(e.timeStampMs) } })
//   probe.samples, probe.summary ({ count, medianMs, worstMs, withinFrame }), probe.done, probe.reset()
// With `expose: true` the samples are also kept on `window.__evenhandLatency` for a browser benchmark.
import { tryOnScopeDispose } from '@vueuse/core'

/** One refresh of a 60 Hz display, the usual screen: a highlight later than this misses a frame. */
export const FRAME_MS = 1000 / 60
export const LATENCY_PRESSES = 20

export interface LatencySummary {
  count: number
  medianMs: number
  worstMs: number
  /** The median fits in one 60 Hz frame. */
  withinFrame: boolean
}

declare global {
  interface Window {
    __evenhandLatency?: readonly number[]
  }
}

/** Median (the mean of the middle two for an even count) and worst of the delays; null for none. */
export function summariseLatency(samples: readonly number[]): LatencySummary | null {
  if (samples.length === 0) return null
  const sorted = [...samples].sort((a, b) => a - b)
  const mid = Math.floor(sorted.length / 2)
  const medianMs = sorted.length % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2
  return { count: sorted.length, medianMs, worstMs: sorted[sorted.length - 1]!, withinFrame: medianMs <= FRAME_MS }
}

export interface LatencyProbeOptions {
  /** How many note-ons make one test. */
  presses?: number
  /** Keep the samples on `window.__evenhandLatency` (only behind a query flag: it is a test seam). */
  expose?: boolean
  /** The browser's frame scheduler and clock; tests pass their own. */
  requestFrame?: (callback: FrameRequestCallback) => number
  cancelFrame?: (handle: number) => void
  now?: () => number
}

export interface LatencyProbe {
  presses: number
  samples: Readonly<Ref<readonly number[]>>
  summary: ComputedRef<LatencySummary | null>
  done: ComputedRef<boolean>
  /** Call right after the pressed keys are updated, with the note-on's MIDI time stamp. */
  measure: (timeStampMs: number) => void
  reset: () => void
}

export function useLatencyProbe(options: LatencyProbeOptions = {}): LatencyProbe {
  const presses = options.presses ?? LATENCY_PRESSES
  const requestFrame = options.requestFrame ?? ((cb: FrameRequestCallback) => requestAnimationFrame(cb))
  const cancelFrame = options.cancelFrame ?? ((handle: number) => cancelAnimationFrame(handle))
  const now = options.now ?? (() => performance.now())
  const samples = shallowRef<readonly number[]>([])
  const waiting = new Set<number>()

  function keep(delayMs: number): void {
    if (samples.value.length >= presses) return
    samples.value = [...samples.value, delayMs]
    if (options.expose && import.meta.client) window.__evenhandLatency = samples.value
  }

  function measure(timeStampMs: number): void {
    if (samples.value.length + waiting.size >= presses) return
    // Vue applies the pressed-key change to the DOM in a microtask, so it is in place before any
    // frame callback runs; this frame's style, layout and paint follow right after its callbacks.
    // We read performance.now() in the callback rather than the callback's own timestamp: that
    // timestamp is when the frame began (Chromium gives the vsync time), which can fall before a
    // MIDI message handled late in the same frame and would make its delay too small or negative.
    // performance.now() here is never earlier than the change and at most a paint before the pixels.
    const handle = requestFrame(() => {
      waiting.delete(handle)
      keep(now() - timeStampMs)
    })
    waiting.add(handle)
  }

  function cancelPending(): void {
    waiting.forEach(cancelFrame)
    waiting.clear()
  }

  function reset(): void {
    cancelPending()
    samples.value = []
    if (options.expose && import.meta.client) window.__evenhandLatency = samples.value
  }

  tryOnScopeDispose(cancelPending)

  return {
    presses,
    samples,
    summary: computed(() => summariseLatency(samples.value)),
    done: computed(() => samples.value.length >= presses),
    measure,
    reset,
  }
}
