/**
 * A change a teacher asks for with one button (rename, archive, remove, withdraw): optionally
 * confirmed first (`removeAfterAsking` for a delete), then `done` (a refresh) once it worked; its error is kept for the page to show.
 */
export function useStudioAction(done: () => unknown) {
  const error = ref('')
  const busy = ref(false)

  async function run(action: () => Promise<void>, confirmText?: string): Promise<void> {
    if (confirmText && !window.confirm(confirmText)) return
    error.value = ''
    busy.value = true
    try {
      await action()
      await done()
    }
    catch (e) {
      error.value = errorMessage(e)
    }
    finally {
      busy.value = false
    }
  }

  /** Deletes what `url` names once the teacher has said yes to `question`. */
  const removeAfterAsking = (url: string, question: string): Promise<void> => run(async () => {
    await $fetch(url, { method: 'DELETE' })
  }, question)

  return { error, busy, run, removeAfterAsking }
}
