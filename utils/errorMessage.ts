/** The server's own message from a failed $fetch, else a plain fallback. */
export function errorMessage(error: unknown, fallback = 'Something went wrong. Please try again.'): string {
  const data = (error as { data?: { message?: string } })?.data
  return data?.message || fallback
}
