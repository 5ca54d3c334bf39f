import type { z } from 'zod'

/**
 * A sign-in or sign-up form: checks the fields with the route's own zod schema before sending,
 * posts them, refreshes the session and moves on; any error becomes one readable message.
 */
export function useSignInForm<S extends z.ZodType>(schema: S, initial: z.input<S>, endpoint: string, next: () => string) {
  const { fetch: refreshSession } = useUserSession()
  const form = reactive({ ...initial as object }) as z.input<S>
  const error = ref('')
  const busy = ref(false)

  async function submit(): Promise<void> {
    error.value = ''
    const parsed = schema.safeParse(form)
    if (!parsed.success) {
      error.value = parsed.error.issues.map(i => i.message).join('. ')
      return
    }
    busy.value = true
    try {
      await $fetch(endpoint, { method: 'POST', body: parsed.data as Record<string, unknown> })
      await refreshSession()
      await navigateTo(next())
    }
    catch (e) {
      error.value = errorMessage(e)
    }
    finally {
      busy.value = false
    }
  }

  return { form, error, busy, submit }
}
