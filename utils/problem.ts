// What went wrong, told apart the way a person needs it: a page that is not there, one that is not
// theirs, no connection, or a fault of ours. Used by error.vue and by pages whose fetch failed.

export type ProblemKind = 'missing' | 'forbidden' | 'signed-out' | 'offline' | 'fault'

export interface Problem {
  kind: ProblemKind
  title: string
  text: string
}

/** The status of a failed fetch or a Nuxt error; a fetch that never reached the server has none. */
export function problemStatus(error: unknown): number | undefined {
  const e = error as { statusCode?: number, status?: number } | null | undefined
  const status = e?.statusCode ?? e?.status
  return typeof status === 'number' && status > 0 ? status : undefined
}

/**
 * `what` names the thing the page shows ("drill", "attempt"); `online` is the browser's own idea
 * (navigator.onLine), which only counts when the request got no answer at all.
 */
export function describeProblem(status: number | undefined, what = 'page', online = true): Problem {
  if (status === 404) {
    return { kind: 'missing', title: `This ${what} isn't here`, text: `The link may be mistyped, or the ${what} was removed.` }
  }
  if (status === 403) {
    return { kind: 'forbidden', title: `This ${what} isn't yours to open`, text: `It belongs to another student or studio. If you think it should be yours, ask your teacher.` }
  }
  if (status === 401) {
    return { kind: 'signed-out', title: 'Please sign in again', text: 'Your session has ended.' }
  }
  if (status === undefined || !online) {
    return { kind: 'offline', title: 'No connection to Evenhand', text: 'Check your network and try again. Attempts you play meanwhile are kept on this device.' }
  }
  return { kind: 'fault', title: 'Something went wrong on our side', text: 'It is not your doing. Try again in a moment; if it keeps happening, tell your teacher.' }
}
