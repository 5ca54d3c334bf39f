/**
 * Runs `callback` in a task of its own once the next frame has been drawn. For what a key press
 * changes besides the key itself: done in the same task, it would be rendered before the frame
 * that lights the key. Chromium styles, lays out and paints a frame in the task that runs its
 * animation-frame callbacks, so a task queued from one of them starts after that paint.
 * A hidden page draws no frames, so there the callback only waits for a task.
 */
export function afterNextPaint(callback: () => void): void {
  if (document.visibilityState === 'hidden') setTimeout(callback, 0)
  else requestAnimationFrame(() => setTimeout(callback, 0))
}
