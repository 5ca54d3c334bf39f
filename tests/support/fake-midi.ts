// A stand-in for the browser's Web MIDI access, installed before any page script runs.
// It speaks the Web MIDI API's shapes (MIDIAccess with an `inputs` map, MIDIInput with
// `onmidimessage`, messages carrying `data` bytes and a performance.now()-based `timeStamp`),
// so webmidi and our composable run unchanged. The test drives it through `window.__fakeMidi`.
export const FAKE_MIDI_INPUT_NAME = 'Evenhand Test Keys'

export const fakeMidiScript = `(() => {
  const input = new EventTarget()
  Object.assign(input, {
    id: 'fake-input-1', name: ${JSON.stringify(FAKE_MIDI_INPUT_NAME)}, manufacturer: 'Evenhand tests',
    type: 'input', state: 'connected', connection: 'open', version: '1', onmidimessage: null, onstatechange: null,
    open: async () => input, close: async () => input,
  })
  const access = new EventTarget()
  Object.assign(access, { inputs: new Map([[input.id, input]]), outputs: new Map(), sysexEnabled: false, onstatechange: null })
  function deliver(data, timeStamp) {
    const event = new Event('midimessage')
    Object.defineProperty(event, 'data', { value: new Uint8Array(data) })
    Object.defineProperty(event, 'timeStamp', { value: timeStamp })
    if (typeof input.onmidimessage === 'function') input.onmidimessage(event)
    input.dispatchEvent(event)
  }
  window.__fakeMidi = {
    send: (data, timeStamp = performance.now()) => deliver(data, timeStamp),
    /** Plays notes at ms offsets from now: [{ note, velocity, atMs, holdMs }]; resolves after the last release. */
    play: (notes) => new Promise((resolve) => {
      const t0 = performance.now() + 50
      let last = 0
      for (const n of notes) {
        last = Math.max(last, n.atMs + n.holdMs)
        setTimeout(() => deliver([0x90, n.note, n.velocity], performance.now()), t0 + n.atMs - performance.now())
        setTimeout(() => deliver([0x80, n.note, 0], performance.now()), t0 + n.atMs + n.holdMs - performance.now())
      }
      setTimeout(resolve, t0 + last + 30 - performance.now())
    }),
  }
  navigator.requestMIDIAccess = async () => access
})()`
