// A stand-in for the browser's MIDIAccess, shaped as webmidi reads it: ports are EventTargets
// with on* handler properties, and plugging in or out goes through the access's onstatechange.

type Handler = ((event: unknown) => void) | null

export class FakeMidiInput extends EventTarget {
  readonly type = 'input'
  state: 'connected' | 'disconnected' = 'connected'
  connection: 'open' | 'closed' | 'pending' = 'closed'
  onmidimessage: Handler = null
  onstatechange: Handler = null

  constructor(readonly id: string, readonly name: string, readonly manufacturer = 'Evenhand Test Works') {
    super()
  }

  async open(): Promise<this> {
    this.connection = 'open'
    return this
  }

  async close(): Promise<this> {
    this.connection = 'closed'
    return this
  }

  /** Delivers raw MIDI bytes stamped with the given high-resolution time. */
  send(bytes: number[], timeStamp: number): void {
    this.onmidimessage?.({ data: new Uint8Array(bytes), timeStamp, target: this })
  }
}

export class FakeMidiAccess {
  readonly inputs = new Map<string, FakeMidiInput>()
  readonly outputs = new Map<string, never>()
  readonly sysexEnabled = false
  onstatechange: Handler = null

  constructor(inputs: FakeMidiInput[]) {
    for (const input of inputs) this.inputs.set(input.id, input)
  }

  /** Some browsers drop a vanished port from `inputs`, others keep it there as disconnected. */
  unplug(input: FakeMidiInput, { keepListed = false } = {}): void {
    if (!keepListed) this.inputs.delete(input.id)
    input.state = 'disconnected'
    // Chrome reports an open port that vanishes as disconnected with its connection pending.
    input.connection = 'pending'
    this.onstatechange?.({ port: input, timeStamp: performance.now() })
  }

  plugIn(input: FakeMidiInput): void {
    this.inputs.set(input.id, input)
    input.state = 'connected'
    input.connection = 'open'
    this.onstatechange?.({ port: input, timeStamp: performance.now() })
  }
}

/** Replaces navigator.requestMIDIAccess; returns a function that puts the original back. */
export function installMidi(access: (() => Promise<FakeMidiAccess>) | undefined): () => void {
  const had = Object.getOwnPropertyDescriptor(navigator, 'requestMIDIAccess')
  Object.defineProperty(navigator, 'requestMIDIAccess', { value: access, configurable: true, writable: true })
  return () => {
    if (had) Object.defineProperty(navigator, 'requestMIDIAccess', had)
    else delete (navigator as { requestMIDIAccess?: unknown }).requestMIDIAccess
  }
}
