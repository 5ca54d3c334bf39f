import type { z } from 'zod'

/** A sign-in or sign-up form: posts the checked fields, refreshes the session and moves on. */
export function useSignInForm<S extends z.ZodType>(schema: S, initial: z.input<S>, endpoint: string, next: () => string) {
  const { fetch: refreshSession } = useUserSession()
  return useZodForm(schema, initial, async (data) => {
    await $fetch(endpoint, { method: 'POST', body: data as Record<string, unknown> })
    await refreshSession()
    await navigateTo(next())
  })
}
