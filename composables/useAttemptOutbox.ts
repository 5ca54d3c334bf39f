import { createSharedComposable, tryOnScopeDispose, useEventListener } from '@vueuse/core'
import { z } from 'zod'
import { AttemptInput } from '#shared/types/attempt'
import type { GradeResult } from '#shared/engine'

/**
 * One localStorage key per attempt, written directly rather than through useLocalStorage:
 * a single list under one key would let two open tabs overwrite each other's attempts, and
 * vueuse's storage writer skips a second write in the same tick. localStorage is synchronous,
 * so the attempt is on disk before the request leaves.
 */
const KEY_PREFIX = 'evenhand.outbox.'

const OutboxEntry = z.object({
  attempt: AttemptInput,
  /**
   * Who played it; null when no one was signed in. Such an entry is never sent by itself: whoever
   * signs in next may be someone else, so it waits until a student says it is theirs or discards it.
   */
  userId: z.number().int().positive().nullable(),
  savedAt: z.iso.datetime(),
  tries: z.number().int().nonnegative(),
  /** Epoch ms of the next automatic try. */
  nextTryAt: z.number(),
  lastError: z.string().nullable(),
  /** Set when the server refused the attempt for good (a 4xx); kept for the student to see. */
  rejected: z.object({ status: z.number().int(), message: z.string() }).nullable(),
})
export type OutboxEntry = z.infer<typeof OutboxEntry>

/** What the server answers to a saved attempt (the fields the practice page reads). */
export interface SavedAttempt {
  id: string
  score: number
  result: GradeResult
}

export type SaveOutcome =
  | { status: 'sent', attempt: SavedAttempt }
  | { status: 'queued', message: string }
  | { status: 'rejected', message: string }

export type OutboxState = 'idle' | 'saving' | 'waiting'

export interface AttemptOutbox {
  /** Attempts of the signed-in student still to be sent, oldest first. */
  pending: ComputedRef<OutboxEntry[]>
  /** Attempts the server refused, with its reason; they stay until discarded. */
  rejected: ComputedRef<OutboxEntry[]>
  /** Attempts played while no one was signed in on this device: sent only once claimed. */
  unclaimed: ComputedRef<OutboxEntry[]>
  lastError: Readonly<Ref<string | null>>
  state: ComputedRef<OutboxState>
  /** Keeps the attempt on this device, then sends it. Never throws for network or server trouble. */
  save: (attempt: AttemptInput) => Promise<SaveOutcome>
  /** Sends every pending attempt now (on a new visit, on coming back online, on a timer). */
  flush: () => Promise<void>
  /** Removes a refused or unclaimed attempt once the student has seen it. */
  discard: (attemptId: string) => void
  /** Makes an attempt played while signed out the signed-in student's own, and sends it. */
  claim: (attemptId: string) => Promise<void>
}

const FIRST_RETRY_MS = 2_000
const LAST_RETRY_MS = 5 * 60_000
// Not the server saying no: signed out (sign in again and it goes through), timed out, or busy.
const RETRIED_CLIENT_ERRORS = new Set([401, 408, 429])

export function retryDelayMs(tries: number): number {
  return Math.min(LAST_RETRY_MS, FIRST_RETRY_MS * 2 ** Math.max(0, tries - 1))
}

function statusOf(error: unknown): number | null {
  const status = (error as { statusCode?: unknown, status?: unknown } | null)
  const code = status?.statusCode ?? status?.status
  return typeof code === 'number' ? code : null
}

function isRefusal(status: number | null): status is number {
  return status !== null && status >= 400 && status < 500 && !RETRIED_CLIENT_ERRORS.has(status)
}

function failureMessage(error: unknown, status: number | null): string {
  if (status === null) return 'No connection to Evenhand; the attempt is kept on this device and will be sent when the connection is back.'
  if (status === 401) return 'You are signed out; the attempt is kept on this device and will be sent when you sign in again.'
  if (isRefusal(status)) return errorMessage(error, `The server refused the attempt (${status}).`)
  return errorMessage(error, `The server could not save the attempt (${status}); it is kept on this device and will be sent later.`)
}

function readEntries(): OutboxEntry[] {
  const entries: OutboxEntry[] = []
  for (let i = 0; i < localStorage.length; i++) {
    const key = localStorage.key(i)
    if (!key?.startsWith(KEY_PREFIX)) continue
    try {
      const parsed = OutboxEntry.safeParse(JSON.parse(localStorage.getItem(key) ?? 'null'))
      // An entry this release cannot read is left where it is: a later one may.
      if (parsed.success) entries.push(parsed.data)
    }
    catch {
      continue
    }
  }
  return entries.sort((a, b) => a.savedAt.localeCompare(b.savedAt))
}

/** One outbox; exported so that tests can make fresh ones (the app uses useAttemptOutbox). */
export function createAttemptOutbox(): AttemptOutbox {
  const { user } = useUserSession()
  const userId = computed(() => user.value?.id ?? null)
  const entries = shallowRef<OutboxEntry[]>(import.meta.client ? readEntries() : [])
  // Entries the browser would not store (private mode, full quota) live on in memory at least.
  const unstored = new Map<string, OutboxEntry>()
  const lastError = ref<string | null>(null)
  // Ids being sent right now, so a flush that starts meanwhile does not send them a second time.
  const sending = shallowRef(new Set<string>())
  let flushing: Promise<void> | null = null
  let timer: ReturnType<typeof setTimeout> | null = null

  const mine = computed(() => entries.value.filter(e => e.userId !== null && e.userId === userId.value))
  const pending = computed(() => mine.value.filter(e => !e.rejected))
  const rejected = computed(() => mine.value.filter(e => e.rejected))
  const unclaimed = computed(() => (userId.value === null ? [] : entries.value.filter(e => e.userId === null)))
  const state = computed<OutboxState>(() => (sending.value.size > 0 ? 'saving' : pending.value.length > 0 ? 'waiting' : 'idle'))

  function reload(): void {
    const stored = readEntries()
    const ids = new Set(stored.map(e => e.attempt.id))
    entries.value = [...stored, ...[...unstored.values()].filter(e => !ids.has(e.attempt.id))]
  }

  // This tab's own writes change the list in memory: reading every stored entry back (each checked by its schema)
  // on every save cost milliseconds a loop's next pass was being played in. Other tabs' writes come through the
  // storage event, which reloads.
  function put(entry: OutboxEntry): void {
    try {
      localStorage.setItem(KEY_PREFIX + entry.attempt.id, JSON.stringify(entry))
      unstored.delete(entry.attempt.id)
    }
    catch {
      unstored.set(entry.attempt.id, entry)
      lastError.value = 'This browser would not keep a copy of the attempt; keep this page open until it is sent.'
    }
    entries.value = [...entries.value.filter(e => e.attempt.id !== entry.attempt.id), entry].sort((a, b) => a.savedAt.localeCompare(b.savedAt))
  }

  function remove(attemptId: string): void {
    localStorage.removeItem(KEY_PREFIX + attemptId)
    unstored.delete(attemptId)
    entries.value = entries.value.filter(e => e.attempt.id !== attemptId)
  }

  function scheduleRetry(): void {
    if (timer) clearTimeout(timer)
    timer = null
    const next = Math.min(...pending.value.map(e => e.nextTryAt))
    if (Number.isFinite(next) && userId.value !== null) timer = setTimeout(() => void flush(), Math.max(1_000, next - Date.now()))
  }

  async function send(entry: OutboxEntry): Promise<SaveOutcome> {
    sending.value = new Set(sending.value).add(entry.attempt.id)
    try {
      const answer = await $fetch<{ attempt: SavedAttempt }>('/api/attempts', { method: 'POST', body: entry.attempt, retry: 0 })
      remove(entry.attempt.id)
      lastError.value = null
      return { status: 'sent', attempt: answer.attempt }
    }
    catch (error) {
      const status = statusOf(error)
      const message = failureMessage(error, status)
      lastError.value = message
      if (isRefusal(status)) {
        put({ ...entry, lastError: message, rejected: { status, message } })
        return { status: 'rejected', message }
      }
      const tries = entry.tries + 1
      put({ ...entry, tries, nextTryAt: Date.now() + retryDelayMs(tries), lastError: message })
      return { status: 'queued', message }
    }
    finally {
      const rest = new Set(sending.value)
      rest.delete(entry.attempt.id)
      sending.value = rest
    }
  }

  async function save(input: AttemptInput): Promise<SaveOutcome> {
    const parsed = AttemptInput.safeParse(input)
    if (!parsed.success) throw new Error(`The attempt cannot be saved: ${z.prettifyError(parsed.error)}`)
    const attempt = parsed.data
    const entry: OutboxEntry = entries.value.find(e => e.attempt.id === attempt.id) ?? {
      attempt,
      userId: userId.value,
      savedAt: new Date().toISOString(),
      tries: 0,
      nextTryAt: Date.now(),
      lastError: null,
      rejected: null,
    }
    put(entry)
    if (entry.userId === null) {
      return { status: 'queued', message: 'You are signed out; the attempt is kept on this device until you sign in and say it is yours.' }
    }
    // Kept on this device above, before anything else; the request goes in a task of its own, so a loop's next
    // pass and the grade on screen are not held back by it.
    await nextTask()
    const outcome = await send(entry)
    if (outcome.status === 'queued') scheduleRetry()
    return outcome
  }

  async function sendPending(): Promise<void> {
    if (userId.value === null) return
    for (const entry of pending.value.filter(e => !sending.value.has(e.attempt.id))) {
      const outcome = await send(entry)
      // Once one fails for want of a connection or a willing server, the rest would too.
      if (outcome.status === 'queued') break
    }
  }

  function flush(): Promise<void> {
    if (import.meta.server) return Promise.resolve()
    flushing ??= sendPending().finally(() => {
      flushing = null
      scheduleRetry()
    })
    return flushing
  }

  function discard(attemptId: string): void {
    if (![...rejected.value, ...unclaimed.value].some(e => e.attempt.id === attemptId)) {
      throw new Error('Only an attempt the server refused, or one played while signed out, can be discarded')
    }
    remove(attemptId)
  }

  function claim(attemptId: string): Promise<void> {
    const entry = unclaimed.value.find(e => e.attempt.id === attemptId)
    if (!entry || userId.value === null) throw new Error('Only an attempt played while signed out can be claimed, by someone signed in')
    put({ ...entry, userId: userId.value, nextTryAt: Date.now() })
    return flush()
  }

  if (import.meta.client) {
    useEventListener(window, 'online', () => void flush())
    useEventListener(window, 'storage', (e: StorageEvent) => {
      if (e.key === null || e.key.startsWith(KEY_PREFIX)) reload()
    })
    // Attempts wait while signed out and go when their student signs in again.
    watch(userId, (id) => {
      if (id !== null) void flush()
    })
  }
  tryOnScopeDispose(() => {
    if (timer) clearTimeout(timer)
  })

  return { pending, rejected, unclaimed, lastError: readonly(lastError), state, save, flush, discard, claim }
}

/** The attempt outbox, one per tab: saves attempts so that none a student played is ever lost. */
export const useAttemptOutbox: () => AttemptOutbox = createSharedComposable(createAttemptOutbox)
