// The API's description (DEVELOPERS.md, "Running things"): Nitro generates it from the route files and the
// development server serves it. This starts `nuxi dev` on these sources, reads the description at the path
// DEVELOPERS.md names, and holds it against the server/api file tree and against the OpenAPI specification
// (through @apidevtools/swagger-parser, which checks a document against the specification's own JSON Schema).
import { spawn } from 'node:child_process'
import type { ChildProcess } from 'node:child_process'
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import SwaggerParser from '@apidevtools/swagger-parser'
import type { OpenAPI } from 'openapi-types'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { apiRoutes } from '../support/route-table'
import { freePort, stopGroup } from '../support/processes'
import { makeAccount } from '../support/accounts'
import { closeTestDb } from '../support/server'

const ROOT = join(import.meta.dirname, '../..')

/** The path DEVELOPERS.md gives for the description, so the test fails when the two part. */
function documentedPath(): string {
  const line = readFileSync(join(ROOT, 'DEVELOPERS.md'), 'utf8').split('\n').find(l => l.includes('The API\'s description'))
  const path = /`(\/[^`\s]+)` on the dev server/.exec(line ?? '')?.[1]
  if (!path) throw new Error('DEVELOPERS.md names no path for the API\'s description')
  return path
}

/** The environment of a developer's shell: vitest's own variables would start Nuxt in its test mode. */
function devEnv(): NodeJS.ProcessEnv {
  const env = Object.fromEntries(Object.entries(process.env).filter(([key]) => !/^(VITEST.*|TEST|NODE_ENV)$/.test(key)))
  // Its own build folder, so it neither meets `nuxi prepare`'s .nuxt nor the test build; inside the clone, where
  // the built server finds node_modules. No outbox worker: the test stack's app sends the mail.
  return { ...env, EVENHAND_BUILD_DIR: join(ROOT, '.data/nuxt-dev-openapi'), NUXT_MAIL_POLL_MS: '0' }
}

interface Operation { parameters?: { name: string, in: string }[] }
type Description = { openapi: string, info: { title: string, version: string }, paths: Record<string, Record<string, Operation>> }

const PATH = documentedPath()
let dev: ChildProcess | undefined
let output = ''
let reply: { status: number, type: string | null, body: unknown }

beforeAll(async () => {
  const port = await freePort()
  dev = spawn(join(ROOT, 'node_modules/.bin/nuxi'), ['dev', '--port', String(port), '--host', '127.0.0.1'], { cwd: ROOT, detached: true, stdio: ['ignore', 'pipe', 'pipe'], env: devEnv() })
  dev.stdout!.on('data', (chunk: Buffer) => (output += chunk))
  dev.stderr!.on('data', (chunk: Buffer) => (output += chunk))
  const end = Date.now() + 100_000
  while (dev.exitCode === null && Date.now() < end) {
    const res = await fetch(`http://127.0.0.1:${port}${PATH}`).catch(() => undefined)
    // Until Nitro's dev build is ready, the dev server answers with a loading page.
    if (res?.ok && res.headers.get('content-type')?.includes('json')) {
      reply = { status: res.status, type: res.headers.get('content-type'), body: await res.json() }
      return
    }
    await new Promise(resolve => setTimeout(resolve, 500))
  }
  throw new Error(`nuxi dev did not serve ${PATH}:\n${output.slice(-3000)}`)
}, 120_000)

afterAll(async () => {
  if (dev?.pid) await stopGroup(dev.pid, 20_000)
  await closeTestDb()
})

/** `POST /api/attempts/[id]/comments` → the description's path, method and path parameters. */
function expected(route: string): { path: string, method: string, params: string[] } {
  const [method, file] = route.split(' ') as [string, string]
  return {
    path: file.replace(/\[(\w+)\]/g, '{$1}'),
    method: method.toLowerCase(),
    params: [...file.matchAll(/\[(\w+)\]/g)].map(m => m[1]!),
  }
}

describe('the API\'s description', () => {
  it('is a valid OpenAPI 3.1 document, served as JSON at the path DEVELOPERS.md names', async () => {
    expect(reply.status).toBe(200)
    expect(reply.type).toMatch(/^application\/json/)
    const doc = reply.body as Description
    expect(doc.openapi).toMatch(/^3\.1\.\d+$/)
    // Rejects (naming the fault) any document the OpenAPI 3.1 schema refuses: a path not starting with "/",
    // an operation without responses, a missing info.title or info.version.
    await expect(SwaggerParser.validate(structuredClone(doc) as unknown as OpenAPI.Document)).resolves.toMatchObject({ info: { title: doc.info.title } })
    expect(doc.info.title).not.toBe('')
    expect(doc.info.version).not.toBe('')
  })

  it('lists every route file under server/api with its method and path parameters, and no route without a file', () => {
    const doc = reply.body as Description
    const fromFiles = apiRoutes().map(expected)
    const described = Object.entries(doc.paths)
      // nuxt-auth-utils' own session route comes from the module, not from a file of ours.
      .filter(([path]) => path.startsWith('/api/') && !path.startsWith('/api/_auth/'))
      .flatMap(([path, methods]) => Object.entries(methods).map(([method, op]) => ({
        path,
        method,
        params: (op.parameters ?? []).filter(p => p.in === 'path').map(p => p.name),
      })))
    const key = (r: { path: string, method: string }): string => `${r.method.toUpperCase()} ${r.path}`
    expect(described.map(key).sort()).toEqual(fromFiles.map(key).sort())
    for (const route of fromFiles) {
      const params = described.find(d => key(d) === key(route))!.params
      expect(params, key(route)).toEqual(route.params)
    }
  })

  it('is not served by the built app', async () => {
    // Signed in, as the route guard sends anyone else to the sign-in page first.
    const { client } = await makeAccount('teacher')
    const res = await client.get(PATH)
    expect(res.status).toBe(404)
    expect(res.body).not.toHaveProperty('paths')
  })
})
