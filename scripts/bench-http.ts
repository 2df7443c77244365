// HTTP load benchmark: `npm run bench:http`. Starts the built server (.output, from `npx nuxt build`)
// on a free loopback port with a fresh demo database, its mail sink and the payment fake, then drives
// it with autocannon: the calendar read and the job list at 50 connections, a storm of bookings for one
// slot, and the calendar read again while large analyses run. Prints requests/s and p50/p99 latency.
import { cpSync, existsSync, mkdtempSync, rmSync } from 'node:fs'
import { cpus, tmpdir, totalmem } from 'node:os'
import { join } from 'node:path'
import autocannon from 'autocannon'
import { plainPart, svgDocument } from '../tests/fixtures/svg'
import type { ApiResponse } from '../utils/api-types'
import { startBuiltApp } from './lib/built-app'

const CONNECTIONS = 50
const DURATION_S = 10
const STORM_JOBS = 100
const PASSWORD = 'kerfbook-demo'

/** A sheet of `side` × `side` rounded parts with two holes each: tens of thousands of contours. */
function largePattern(side: number): string {
  const cellMm = 14
  const parts: string[] = []
  for (let row = 0; row < side; row++) {
    for (let column = 0; column < side; column++) {
      const x = column * cellMm
      const y = row * cellMm
      parts.push(`<rect x="${x + 1}" y="${y + 1}" width="12" height="12" rx="1.5"/><circle cx="${x + 4}" cy="${y + 7}" r="1.2"/><circle cx="${x + 10}" cy="${y + 7}" r="1.2"/>`)
    }
  }
  return svgDocument(side * cellMm, side * cellMm, parts.join(''))
}

async function api<T = unknown>(baseUrl: string, cookie: string, method: string, path: string, body?: unknown): Promise<T> {
  const response = await fetch(baseUrl + path, {
    method,
    headers: { cookie, ...(body instanceof FormData || body === undefined ? {} : { 'content-type': 'application/json' }) },
    body: body instanceof FormData ? body : body === undefined ? undefined : JSON.stringify(body),
  })
  const text = await response.text()
  if (response.status >= 400) throw new Error(`${method} ${path}: ${response.status} ${text.slice(0, 300)}`)
  return (text ? JSON.parse(text) : undefined) as T
}

async function signIn(baseUrl: string, email: string): Promise<string> {
  const response = await fetch(`${baseUrl}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: PASSWORD }) })
  if (response.status !== 200) throw new Error(`sign-in as ${email}: ${response.status}`)
  return response.headers.getSetCookie()[0]!.split(';')[0]!
}

function fileForm(svg: string, name: string): FormData {
  const form = new FormData()
  form.set('file', new Blob([svg], { type: 'image/svg+xml' }), name)
  return form
}

function report(label: string, result: autocannon.Result): void {
  const statuses = Object.entries(result.statusCodeStats ?? {})
    .map(([status, { count }]) => `${status}×${count}`)
    .join(' ')
  console.log(
    `${label.padEnd(44)} ${result.requests.average.toFixed(0).padStart(6)} req/s   p50 ${String(result.latency.p50).padStart(4)} ms   p99 ${String(result.latency.p99).padStart(5)} ms   ${statuses}${result.errors ? `   errors ${result.errors}` : ''}`,
  )
}

async function main(): Promise<void> {
  if (!existsSync('.output/server/index.mjs')) {
    console.error('No built server in .output — run `npx nuxt build` first.')
    process.exit(1)
  }
  // A private copy, so a rebuild of .output during the run cannot pull chunks from under the server.
  const copyDir = mkdtempSync(join(tmpdir(), 'kerfbook-bench-output-'))
  cpSync('.output', copyDir, { recursive: true })
  const app = await startBuiltApp({ name: 'kerfbook-bench-http', outputDir: copyDir, env: { SIGN_IN_LIMIT_PER_MINUTE: '1000' } })
  const { baseUrl } = app
  try {
    const member = await signIn(baseUrl, 'member@example.test')
    const staff = await signIn(baseUrl, 'staff@example.test')
    const overview = await api<ApiResponse<'/api/catalog/overview'>>(baseUrl, member, 'GET', '/api/catalog/overview')
    const heron = overview.find((c) => c.name.startsWith('Heron'))!
    const cutterId = heron.cutterId
    const materialId = heron.materials.find((m) => m.name === 'Birch plywood')!.materialId

    console.log(`Preparing ${STORM_JOBS} approved jobs…`)
    const jobIds: number[] = []
    for (let i = 0; i < STORM_JOBS; i++) {
      const job = await api<ApiResponse<'/api/jobs', 'post'>>(baseUrl, member, 'POST', '/api/jobs', { title: `Bench job ${i}`, cutterId, materialId })
      await api(baseUrl, member, 'POST', `/api/jobs/${job.id}/files`, fileForm(plainPart(), 'part.svg'))
      await api(baseUrl, member, 'POST', `/api/jobs/${job.id}/submit`, {})
      await api(baseUrl, staff, 'POST', `/api/jobs/${job.id}/approve`, {})
      jobIds.push(job.id)
    }
    const { slots } = await api<ApiResponse<'/api/bookings/suggestions'>>(baseUrl, member, 'GET', `/api/bookings/suggestions?jobId=${jobIds[0]}`)
    const slotStart = slots[0]!.start
    const from = new Date(Date.now()).toISOString()
    const to = new Date(Date.now() + 28 * 86_400_000).toISOString()
    const calendarPath = `/api/bookings?cutter=${cutterId}&from=${encodeURIComponent(from)}&to=${encodeURIComponent(to)}`

    console.log(`\nMachine: ${cpus().length} CPUs (${cpus()[0]?.model.trim()}), ${(totalmem() / 1024 ** 3).toFixed(1)} GB memory, Node ${process.version}`)
    console.log(`${CONNECTIONS} connections, ${DURATION_S} s each\n`)
    const load = (path: string, extra: Partial<autocannon.Options> = {}) =>
      autocannon({ url: baseUrl + path, connections: CONNECTIONS, duration: DURATION_S, headers: { cookie: member }, ...extra })

    report('GET /api/bookings (calendar, 4 weeks)', await load(calendarPath))
    report(`GET /api/jobs (${STORM_JOBS} jobs)`, await load('/api/jobs'))

    // Every connection asks for the same slot with a job of its own: one must win, the rest hear 409.
    let nextJob = 0
    const storm = await autocannon({
      url: baseUrl,
      connections: CONNECTIONS,
      amount: STORM_JOBS,
      headers: { cookie: member, 'content-type': 'application/json' },
      requests: [{ method: 'POST', path: '/api/bookings', setupRequest: (request) => ({ ...request, body: JSON.stringify({ jobId: jobIds[nextJob++ % jobIds.length], cutterId, start: slotStart }) }) }],
    })
    report(`POST /api/bookings (${STORM_JOBS} for one slot)`, storm)

    // Large analyses back to back for the whole run, so the calendar is read while the workers are busy.
    const pattern = largePattern(150)
    let analysing = true
    let analyses = 0
    const analysisLoop = (async () => {
      while (analysing) {
        await api(baseUrl, member, 'POST', '/api/analysis', fileForm(pattern, 'large-sheet.svg'))
        analyses++
      }
    })()
    report(`GET /api/bookings while analysing ${(pattern.length / 1024 ** 2).toFixed(1)} MB`, await load(calendarPath))
    analysing = false
    await analysisLoop
    console.log(`(${analyses} large analyses finished during that run)`)
  } finally {
    await app.stop()
    rmSync(copyDir, { recursive: true, force: true })
  }
}

main().catch((error) => {
  console.error(error)
  process.exit(1)
})
