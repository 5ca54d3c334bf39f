import type { Serializer } from '@vueuse/core'
import type { z } from 'zod'

/**
 * A useLocalStorage serializer that treats stored text as untrusted input: another tab, an
 * older release or a hand edit may have left anything there, so it is parsed with the schema
 * and replaced by the fallback when it does not fit.
 */
export function validatedSerializer<T>(schema: z.ZodType<T>, fallback: () => T): Serializer<T> {
  return {
    read(raw: string): T {
      try {
        const parsed = schema.safeParse(JSON.parse(raw))
        return parsed.success ? parsed.data : fallback()
      }
      catch {
        return fallback()
      }
    },
    write: (value: T): string => JSON.stringify(value),
  }
}
