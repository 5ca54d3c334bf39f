// Hostile variants of a route's working request, for tests/api/fuzz.test.ts: one to three changes each, to a
// field of the body, the body as a whole, a path parameter, the query or an upload's file and fields.
import fc from 'fast-check'
import type { RouteRequest } from './route-table'

/** Put at the head of some strings, so a reply or a log line that repeats the request can be found. */
export const MARKER = 'hostile-7f3a'

const NUMBERS = [0, -0, -1, 1.5, -(2 ** 31) - 1, 2 ** 31, 2 ** 32, 4_294_967_296, 2 ** 53, 2 ** 53 + 2, 2 ** 63, 2 ** 64, 1e21, 1e308, -1e308, Number.MIN_VALUE]

const NUMBER_LIKE = ['NaN', '-NaN', 'Infinity', '-Infinity', '-1', '-0', '0', '1e309', '-1e309', '1.5', '0x1F', '0b11', '1_000', ' 7 ', '7abc', '9'.repeat(40), '', ' ', 'null', 'undefined', 'true', 'false', '[]', '{}', '[object Object]']

/** Outside MariaDB's TIMESTAMP (1970-01-01 00:00:01 to 2038-01-19 03:14:07 UTC), or not dates at all. */
const DATES = ['1969-12-31T23:59:59Z', '1970-01-01T00:00:00Z', '2038-01-19T03:14:08Z', '2038-01-19T03:14:08.000+00:00', '2100-01-01T00:00:00+14:00', '0000-01-01T00:00:00Z',
  '-000001-01-01T00:00:00Z', '+275760-09-13T00:00:00Z', '9999-12-31T23:59:59.999Z', '2026-02-30T00:00:00Z', '2026-13-01T00:00:00Z', '2026-12-03T25:61:61Z', '1969-12-31', '2038-01-20', '2037-12-32', '9999-12-31', '1900-02-29', '0000-00-00', '0000-00-00 00:00:00']

const UNICODE = ['\u0000', 'a\u0000b', '\u202Eevil', '\uD800', '\uDFFF\uD800', 'e\u0301', '👩🏽‍🎤', '𝄞'.repeat(300), '\u200B'.repeat(50), 'Ω≈ç√∫˜µ≤≥÷', '\r\n\t', '<script>alert(1)</script>', '\' OR 1=1 -- ', '%00', '../../etc/passwd', '=HYPERLINK("x")']

const POLLUTING_KEYS = ['__proto__', 'constructor', 'prototype', '__defineGetter__', 'hasOwnProperty', 'toString', 'valueOf']
/** Keys a client might slip in to claim what is not theirs. */
const CLAIM_KEYS = ['id', 'role', 'isAdmin', 'studentId', 'student_id', 'teacherId', 'ownerId', 'owner_id', 'userId', 'isPublic', 'archived', 'score', 'engineVersion', 'result']

const QUERY_KEYS = ['drill', 'student', 'limit', 'cursor', 'range', 'tz', 'token', 'archived', 'q', 'hand', 'level', 'kind', 'sort', 'id', '__proto__', 'constructor']
const FIELD_KEYS = ['part', 'staff', 'track', 'hand', 'measures', '__proto__', 'file']

// At most three changes stack up, so three of the deepest stay within what JSON.stringify can recurse into.
const deep = (depth: number): unknown => {
  let value: unknown = 1
  for (let i = 0; i < depth; i++) value = [value]
  return value
}

const hugeString = fc.oneof(
  fc.constant(MARKER + 'x'.repeat(10_000)),
  fc.string({ unit: 'grapheme', minLength: 10_000, maxLength: 10_000 }).map(s => MARKER + s),
  fc.constant('é'.repeat(70_000)),
)

export const hostileString: fc.Arbitrary<string> = fc.oneof(
  fc.constantFrom(...NUMBER_LIKE, ...DATES, ...UNICODE),
  fc.string({ unit: 'binary', maxLength: 40 }).map(s => MARKER + s),
  fc.string({ unit: 'grapheme', maxLength: 300 }),
  fc.date({ min: new Date(-8.64e15), max: new Date(8.64e15), noInvalidDate: true }).map(d => d.toISOString()),
  // Shaped like an attempt list's page cursor (`<started at>_<id>`), with a date no TIMESTAMP holds.
  fc.constantFrom(...DATES).map(d => `${d}_0b7e5a3c-1d2f-4e6a-8b9c-0d1e2f3a4b5c`),
  hugeString,
)

/** Any JSON value a hostile client could send where one value is expected. */
export const hostileValue: fc.Arbitrary<unknown> = fc.oneof(
  hostileString,
  fc.constantFrom<unknown>(...NUMBERS, null, true, false, [], {}, deep(60), deep(1000)),
  fc.double(),
  fc.integer(),
  fc.bigInt({ min: -(2n ** 70n), max: 2n ** 70n }).map(n => Number(n)),
  fc.array(fc.oneof(hostileString, fc.integer(), fc.constant(null)), { maxLength: 5 }),
  fc.jsonValue({ maxDepth: 4 }),
  fc.dictionary(fc.constantFrom(...POLLUTING_KEYS, ...CLAIM_KEYS), fc.jsonValue({ maxDepth: 2 }), { maxKeys: 3 }),
  fc.constant(Array.from({ length: 20_000 }, (_, i) => i)),
)

export type Mutation =
  | { kind: 'field', pick: number, shallow: boolean, value: unknown, alike?: number }
  | { kind: 'key', pick: number, key: string, value: unknown }
  | { kind: 'body', value: unknown }
  | { kind: 'raw', text: string }
  | { kind: 'type', value: string }
  | { kind: 'param', pick: number, value: string }
  | { kind: 'query', key: string, values: string[] }
  | { kind: 'file', name: string, bytes: Uint8Array, cut: number }
  | { kind: 'form', key: string, value: string }

const param = fc.record({ kind: fc.constant('param' as const), pick: fc.nat(), value: hostileString })
const query = fc.record({ kind: fc.constant('query' as const), key: fc.oneof(fc.constantFrom(...QUERY_KEYS), fc.string({ maxLength: 8 }), fc.constant('drill[gt]')), values: fc.array(hostileString, { minLength: 1, maxLength: 3 }) })
const body = fc.oneof(
  { weight: 4, arbitrary: fc.record({ kind: fc.constant('field' as const), pick: fc.nat(), shallow: fc.boolean(), value: hostileValue, alike: fc.option(fc.nat(), { nil: undefined }) }) },
  { weight: 2, arbitrary: fc.record({ kind: fc.constant('key' as const), pick: fc.nat(), key: fc.constantFrom(...POLLUTING_KEYS, ...CLAIM_KEYS), value: hostileValue }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant('body' as const), value: hostileValue }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant('raw' as const), text: fc.oneof(fc.constantFrom('{', '{"a":', '[1,2', 'null', '"text"', '{"__proto__":{"role":"admin"}}', '{"a":1}{"b":2}', '\uFEFF{}', 'NaN'), fc.string({ maxLength: 50 })) }) },
)
/** The body's declared type: a form or text a cross-site page could send, or JSON in another character set. */
const contentType = fc.record({ kind: fc.constant('type' as const), value: fc.constantFrom('application/x-www-form-urlencoded', 'text/plain', 'multipart/form-data; boundary=x', 'application/json; charset=utf-16', 'application/xml', 'application/json, text/plain', '') })
const upload = fc.oneof(
  fc.record({ kind: fc.constant('file' as const), name: hostileString.map(s => s.slice(0, 300)), bytes: fc.uint8Array({ maxLength: 4096 }), cut: fc.nat() }),
  fc.record({ kind: fc.constant('form' as const), key: fc.constantFrom(...FIELD_KEYS), value: hostileString }),
)

/** Changes a request to `method` can take: a GET has no body, an upload has a form instead of JSON. */
export function mutations(method: string, isUpload: boolean): fc.Arbitrary<Mutation[]> {
  const parts: fc.Arbitrary<Mutation>[] = [param, query]
  if (isUpload) parts.push(upload, upload)
  else if (method !== 'GET') parts.push(body, body, body, contentType)
  return fc.array(fc.oneof(...parts), { minLength: 1, maxLength: 3 })
}

/**
 * A hostile value of the same kind as `original`, the `n`th of its kind: a date-time gets a date outside 1970–2038
 * or no date at all, a number a huge, negative, fractional or number-like one, a text a long or odd one.
 */
export function alike(original: unknown, n: number): unknown {
  const pick = <T>(pool: readonly T[]): T => pool[n % pool.length]!
  if (typeof original === 'string' && /^\d{4}-\d{2}-\d{2}/.test(original)) return pick(DATES)
  if (typeof original === 'number') return pick([...NUMBERS, ...NUMBER_LIKE])
  if (typeof original === 'string') return pick([...UNICODE, ...NUMBER_LIKE, MARKER + 'x'.repeat(10_000)])
  if (typeof original === 'boolean') return pick(['true', 1, 0, null, 'yes'])
  if (Array.isArray(original)) {
    // Copies, not references to one element that a later change inside one would reach in all; as many as make
    // about 3 MB (past the 2 MB body limit) and at most 20,000, as a long list of large elements would not fit in memory.
    const first = original[0] ?? 1
    const copies = Math.max(1, Math.min(20_000, Math.floor(3_000_000 / ((JSON.stringify(first)?.length ?? 1) + 1))))
    return pick([[], [original], Array.from({ length: copies }, () => structuredClone(first)), {}, null])
  }
  return pick([null, [], 'text', 0, deep(1000)])
}

type Path = (string | number)[]

/** Every place inside a JSON value, the value itself first; not below 20 levels, where an earlier change may have nested thousands. */
function places(value: unknown, at: Path = []): Path[] {
  if (at.length >= 20) return [at]
  const inner = Array.isArray(value)
    ? value.flatMap((v, i) => places(v, [...at, i]))
    : value && typeof value === 'object' ? Object.entries(value).flatMap(([k, v]) => places(v, [...at, k])) : []
  return [at, ...inner]
}

/** Sets `key` as an own property even where it is `__proto__`, so JSON.stringify sends it. */
function setOwn(target: Record<string | number, unknown>, key: string | number, value: unknown): void {
  Object.defineProperty(target, key, { value, enumerable: true, writable: true, configurable: true })
}

function setAt(root: unknown, at: Path, value: unknown): unknown {
  if (!at.length) return value
  let node = root as Record<string | number, unknown>
  for (const step of at.slice(0, -1)) node = node[step] as Record<string | number, unknown>
  setOwn(node, at.at(-1)!, value)
  return root
}

/** Node refuses a request line and headers past 16 KB before any route runs; nine of these (three changes of up to three values) stay below it.
 *  The cut may split a %XX escape, which a server must take as well. */
const inUrl = (value: string): string => Array.from(Buffer.from(value), (byte) => {
  // Byte by byte, as encodeURIComponent throws on a lone surrogate (sent as U+FFFD, as any client would).
  const char = String.fromCharCode(byte)
  return /[\w.~-]/.test(char) ? char : `%${byte.toString(16).toUpperCase().padStart(2, '0')}`
}).join('').slice(0, 1200)

export interface HostileRequest extends RouteRequest {
  /** A body sent as this text instead of JSON. */
  raw?: string
  /** Sent as the body's content type instead of JSON's. */
  contentType?: string
}

/**
 * The request with each change made in turn; `template` names the path's parameters (`/api/drills/[id]`).
 * Generated values are placed as copies: fast-check hands out its constants (a 20,000-element list) again and again,
 * and a later change inside a shared one would grow it with every run until a body no longer fits in memory.
 */
export function applyMutations(req: RouteRequest, template: string, list: Mutation[]): HostileRequest {
  const out: HostileRequest = { ...req, body: structuredClone(req.body), upload: req.upload && { file: { ...req.upload.file }, fields: { ...req.upload.fields } } }
  const [pathOnly, search = ''] = out.path.split('?') as [string, string?]
  const segments = pathOnly.split('/')
  const paramAt = template.split('/').flatMap((s, i) => (s.startsWith('[') ? [i] : []))
  const queryParts = search ? search.split('&') : []
  for (const m of list) {
    if (m.kind === 'param' && paramAt.length) segments[paramAt[m.pick % paramAt.length]!] = inUrl(m.value)
    else if (m.kind === 'query') queryParts.push(...m.values.map(v => `${inUrl(m.key)}=${inUrl(v)}`))
    else if (m.kind === 'field') {
      // Half the time a field of the body itself, which a long list (an attempt's events) would otherwise crowd out.
      const all = places(out.body).filter(at => !m.shallow || at.length === 1)
      const at = all.length ? all[m.pick % all.length]! : []
      const original = at.reduce<unknown>((n, step) => (n as Record<string | number, unknown>)[step], out.body)
      out.body = setAt(out.body, at, m.alike === undefined ? structuredClone(m.value) : alike(original, m.alike))
    }
    else if (m.kind === 'key') {
      const objects = places(out.body).filter((at) => {
        const node = at.reduce<unknown>((n, step) => (n as Record<string | number, unknown>)[step], out.body)
        return node !== null && typeof node === 'object' && !Array.isArray(node)
      })
      if (!objects.length) out.body = {}
      const at = objects.length ? objects[m.pick % objects.length]! : []
      const node = at.reduce<unknown>((n, step) => (n as Record<string | number, unknown>)[step], out.body) as Record<string, unknown>
      setOwn(node, m.key, structuredClone(m.value))
    }
    else if (m.kind === 'body') out.body = structuredClone(m.value)
    else if (m.kind === 'raw') out.raw = m.text
    else if (m.kind === 'type') out.contentType = m.value
    else if (m.kind === 'file' && out.upload) {
      const original = typeof out.upload.file.bytes === 'string' ? new TextEncoder().encode(out.upload.file.bytes) : out.upload.file.bytes
      // Half the time the real file cut short, half the time random bytes.
      const bytes = m.cut % 2 ? original.slice(0, m.cut % original.length) : m.bytes
      out.upload.file = { name: m.name, bytes }
    }
    else if (m.kind === 'form' && out.upload) out.upload.fields = { ...out.upload.fields, [m.key]: m.value }
  }
  out.path = segments.join('/') + (queryParts.length ? `?${queryParts.join('&')}` : '')
  return out
}
