// Every route the server has, called as anonymous, the member who owns the test objects, another
// member, staff and admin. The routes come from the files under server/api and server/routes, so a
// new route file fails this test until ROUTE_ACCESS (tests/api/route-access.ts) says who may call it.
import { readdirSync } from 'node:fs'
import { join, relative } from 'node:path'
import { fileURLToPath } from 'node:url'
import { beforeAll, describe, expect, it } from 'vitest'
import { CALLERS, ROUTE_ACCESS, buildWorld, callerClient, type Caller, type Expected, type World } from './route-access'
import type { Client } from './workshop-setup'

const ROOT = fileURLToPath(new URL('../../', import.meta.url))
const ROUTE_FOLDERS = [
  { folder: 'server/api', prefix: '/api' },
  { folder: 'server/routes', prefix: '' },
]
const METHOD_SUFFIX = /\.(get|post|put|patch|delete|head|options)$/

interface RouteFile {
  key: string
  method: string
  path: string
  file: string
}

function filesUnder(folder: string): string[] {
  return readdirSync(folder, { recursive: true, withFileTypes: true })
    .filter((entry) => entry.isFile() && entry.name.endsWith('.ts'))
    .map((entry) => join(entry.parentPath, entry.name))
}

/** Method and path as Nitro derives them from a file name: [param] → :param, index dropped, .method suffix. */
export function routeOfFile(file: string, folder: string, prefix: string): RouteFile {
  const name = relative(folder, file).replace(/\.ts$/, '')
  const method = name.match(METHOD_SUFFIX)?.[1]?.toUpperCase() ?? 'ANY'
  const segments = name
    .replace(METHOD_SUFFIX, '')
    .split('/')
    .filter((segment, i, all) => !(segment === 'index' && i === all.length - 1))
    .map((segment) => segment.replace(/^\[\.\.\.(\w+)\]$/, ':$1*').replace(/\[(\w+)\]/g, ':$1'))
  const path = `${prefix}/${segments.join('/')}`.replace(/\/$/, '') || '/'
  return { key: `${method} ${path}`, method, path, file: relative(ROOT, file) }
}

const ROUTES: RouteFile[] = ROUTE_FOLDERS.flatMap(({ folder, prefix }) =>
  filesUnder(join(ROOT, folder)).map((file) => routeOfFile(file, join(ROOT, folder), prefix)),
)

function fillPath(route: RouteFile, params: Record<string, string | number>): string {
  return route.path.replace(/:(\w+)\*?/g, (_, name: string) => {
    if (params[name] === undefined) throw new Error(`ROUTE_ACCESS['${route.key}'].params gives no value for :${name}`)
    return encodeURIComponent(String(params[name]))
  })
}

/** Why `status` breaks `expected`, or undefined when it meets it. */
function mismatch(status: number, expected: Expected): string | undefined {
  if (status >= 500) return 'a server error'
  if (expected === 'ok') return status >= 200 && status < 300 ? undefined : 'not a 2xx answer'
  if (expected === 'passes') return [401, 403, 404].includes(status) ? 'refused by the guard' : undefined
  return status === expected ? undefined : `not the guard's ${expected}`
}

describe('authorisation matrix', () => {
  it('has an entry in ROUTE_ACCESS for every route file, and none for a route that is gone', () => {
    const keys = new Set(ROUTES.map((r) => r.key))
    const missing = ROUTES.filter((r) => !(r.key in ROUTE_ACCESS)).map((r) => `'${r.key}'  (${r.file})`)
    const stale = Object.keys(ROUTE_ACCESS).filter((key) => !keys.has(key))
    expect(missing, 'routes without an entry in tests/api/route-access.ts ROUTE_ACCESS — say who may call them').toEqual([])
    expect(stale, 'entries in ROUTE_ACCESS whose route file no longer exists').toEqual([])
  })

  describe('each route answers each caller as its policy says', () => {
    let world: World
    const clients = new Map<Caller, Client>()
    beforeAll(async () => {
      world = await buildWorld()
      for (const caller of CALLERS) clients.set(caller, await callerClient(caller))
    })

    // Routes that end every session of the caller's account run last: the other routes' callers share those accounts.
    const endsAll = (route: RouteFile) => Number(!!ROUTE_ACCESS[route.key]!.endsEverySession)
    const declared = ROUTES.filter((route) => route.key in ROUTE_ACCESS).sort((a, b) => endsAll(a) - endsAll(b))
    it.each(declared.map((route) => [route.key, route] as const))('%s', async (_, route) => {
      const access = ROUTE_ACCESS[route.key]!
      const failures: string[] = []
      for (const caller of CALLERS) {
        const actor = access.endsSession ? await callerClient(caller) : clients.get(caller)!
        const path = fillPath(route, (await access.params?.(world, caller)) ?? {})
        const query = access.query ? `?${access.query(world)}` : ''
        const method = route.method === 'ANY' ? 'GET' : route.method
        const response =
          method === 'GET' ? await actor.get(path + query) : method === 'DELETE' ? await actor.delete(path + query) : await actor.raw(method, path + query, JSON.stringify(access.body?.(world) ?? {}))
        const expected = access.policy[caller]
        const problem = mismatch(response.status, expected)
        if (problem) failures.push(`${caller}: ${response.status} is ${problem} (expected ${expected}) — ${JSON.stringify(response.body).slice(0, 160)}`)
        if (caller === 'otherMember' && !access.pathIsCredential) {
          const text = JSON.stringify(response.body)
          const leaked = world.privateMarkers.filter((marker) => text.includes(marker))
          if (leaked.length > 0) failures.push(`otherMember: the answer shows the member's ${leaked.join(', ')}`)
        }
        // A route that ended the session without being declared to would otherwise skew every later call.
        if (caller !== 'anonymous' && !actor.hasCookie()) clients.set(caller, await callerClient(caller))
      }
      expect(failures, `${route.key} (${route.file})`).toEqual([])
    })
  })
})
