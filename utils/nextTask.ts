/**
 * Resolves in a task of its own, so whatever waits (a key pressed, a frame to draw) goes first. A message
 * channel rather than a timer: nested timers are held back by 4 ms or more, and tests fake timers.
 */
export function nextTask(): Promise<void> {
  return new Promise((resolve) => {
    const channel = new MessageChannel()
    channel.port1.onmessage = () => {
      channel.port1.close()
      resolve()
    }
    channel.port2.postMessage(null)
  })
}
