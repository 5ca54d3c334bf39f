/**
 * A page opened from an e-mailed one-time link (`?token=`) whose action waits for a button press, so a
 * mail program that fetches links ahead of its reader changes nothing: the token, and the press's outcome.
 */
export function useLinkAction<T>(act: (token: string) => Promise<T>) {
  const route = useRoute()
  const token = computed(() => (typeof route.query.token === 'string' ? route.query.token : ''))
  const result = ref<T>()
  const error = ref('')
  const busy = ref(false)

  async function run(): Promise<void> {
    busy.value = true
    error.value = ''
    try {
      result.value = await act(token.value)
    }
    catch (e) {
      error.value = errorMessage(e)
    }
    finally {
      busy.value = false
    }
  }

  return { token, result, error, busy, run }
}
