// A listener on the page's loudspeakers, installed before any page script runs. Everything an app
// connects to an AudioContext's destination (through tone or directly) is also fed to two
// AnalyserNodes of that context, so a test can read how loud the output is and at which pitch,
// through the browser's own Web Audio graph. Read it through `window.__audioTap`.
export const audioTapScript = `(() => {
  const connect = AudioNode.prototype.connect
  const taps = new Map()
  AudioNode.prototype.connect = function (destination, ...rest) {
    const result = connect.call(this, destination, ...rest)
    if (destination instanceof AudioDestinationNode) {
      const ctx = destination.context
      if (!taps.has(ctx)) {
        const level = ctx.createAnalyser()
        level.fftSize = 2048
        const spectrum = ctx.createAnalyser()
        spectrum.fftSize = 16384
        spectrum.smoothingTimeConstant = 0
        taps.set(ctx, { ctx, level, spectrum })
      }
      const tap = taps.get(ctx)
      connect.call(this, tap.level, ...rest)
      connect.call(this, tap.spectrum, ...rest)
    }
    return result
  }
  const rms = (tap) => {
    const data = new Float32Array(tap.level.fftSize)
    tap.level.getFloatTimeDomainData(data)
    let sum = 0
    for (const x of data) sum += x * x
    return Math.sqrt(sum / data.length)
  }
  const loudest = () => {
    let best = null
    for (const tap of taps.values()) if (!best || rms(tap) > rms(best)) best = tap
    return best
  }
  window.__audioTap = {
    /** How many audio contexts with something connected to their loudspeaker are running. */
    running: () => [...taps.keys()].filter(ctx => ctx.state === 'running').length,
    /** The loudest RMS level over the next \`ms\` milliseconds, read every 10 ms. */
    peakLevel: ms => new Promise((resolve) => {
      let peak = 0
      const end = performance.now() + ms
      const read = () => {
        for (const tap of taps.values()) peak = Math.max(peak, rms(tap))
        if (performance.now() < end) setTimeout(read, 10)
        else resolve(peak)
      }
      read()
    }),
    /** The strongest frequency (Hz) between lowHz and highHz in the loudest output's last 16,384 samples. */
    strongestBetween: (lowHz, highHz) => strongest(lowHz, highHz).hz,
    /**
     * Every \`everyMs\` for \`ms\`: the strongest frequency between lowHz and highHz and its level (dB), as a
     * listener would follow a melody in that register.
     */
    follow: (lowHz, highHz, ms, everyMs) => new Promise((resolve) => {
      const heard = []
      const end = performance.now() + ms
      const read = () => {
        heard.push({ atMs: performance.now(), ...strongest(lowHz, highHz) })
        if (performance.now() < end) setTimeout(read, everyMs)
        else resolve(heard)
      }
      read()
    }),
  }
  function strongest(lowHz, highHz) {
    const tap = loudest()
    if (!tap) return { hz: 0, db: -Infinity }
    const bins = new Float32Array(tap.spectrum.frequencyBinCount)
    tap.spectrum.getFloatFrequencyData(bins)
    const hzPerBin = tap.ctx.sampleRate / tap.spectrum.fftSize
    let best = Math.ceil(lowHz / hzPerBin)
    for (let i = best; i <= Math.floor(highHz / hzPerBin); i++) if (bins[i] > bins[best]) best = i
    // A parabola through the peak bin and its neighbours places the peak between bins.
    const [a, b, c] = [bins[best - 1], bins[best], bins[best + 1]]
    const offset = (a - c) / (2 * (a - 2 * b + c)) || 0
    return { hz: (best + offset) * hzPerBin, db: b }
  }
})()`
