import type { z } from 'zod'

/** Field path → the message shown beside that field. */
export type FieldErrors = Record<string, string>

/** Issues from a zod failure or from the server's 400 (`data.issues`, the same paths): one message per field. */
export function fieldErrorsFrom(issues: readonly { path: readonly PropertyKey[] | string, message: string }[]): FieldErrors {
  const errors: FieldErrors = {}
  for (const issue of issues) {
    const path = typeof issue.path === 'string' ? issue.path : issue.path.map(String).join('.')
    errors[path] ??= issue.message
  }
  return errors
}

/**
 * A form checked with the route's own zod schema before it is sent. Each field's error sits beside
 * the field (see FormField); a problem that belongs to no field, a refused sign-in say, is `error`.
 * The server's own 400 names fields the same way, so its messages land beside the fields too.
 */
export function useZodForm<S extends z.ZodType>(schema: S, initial: z.input<S>, send: (data: z.output<S>) => Promise<void>) {
  const form = reactive({ ...initial as object }) as z.input<S>
  const fieldErrors = ref<FieldErrors>({})
  const error = ref('')
  const busy = ref(false)

  async function submit(): Promise<void> {
    error.value = ''
    fieldErrors.value = {}
    const parsed = schema.safeParse(form)
    if (!parsed.success) {
      fieldErrors.value = fieldErrorsFrom(parsed.error.issues)
      return
    }
    busy.value = true
    try {
      await send(parsed.data)
    }
    catch (e) {
      const issues = (e as { data?: { data?: { issues?: { path: string, message: string }[] } } })?.data?.data?.issues
      const known = (issues ?? []).filter(i => i.path in (form as object))
      if (known.length) fieldErrors.value = fieldErrorsFrom(known)
      else error.value = errorMessage(e)
    }
    finally {
      busy.value = false
    }
  }

  return { form, fieldErrors, error, busy, submit }
}
