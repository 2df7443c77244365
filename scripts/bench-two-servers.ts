// `npm run bench:two-servers [-- --build --jobs 2000 --days 365 --no-sqlite]`: two app servers on one PostgreSQL
// database under load, on loopback. Builds the app when .output is missing (or with --build), starts a throwaway
// PostgreSQL server, app server A on a new database there with the demo workshop plus invented history, and app
// server B on the same database with A's session key, so a cookie from signing in on A is good on B. Then, with
// autocannon, each phase bounded in time and connections: the calendar read and a member's job list against A
// alone; the same load spread over A and B; 50 bookings racing for one slot, half through each server; and, as a
// reference, the same reads against one server on SQLite. Prints req/s, p50/p99 latency, status counts and how
// busy each process and the machine were. Stops every server and deletes every temporary folder, also on error.
import { execSync } from 'node:child_process'
import { cpSync, existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs'
import { cpus, loadavg, tmpdir, totalmem } from 'node:os'
import { join } from 'node:path'
import { parseArgs } from 'node:util'
import autocannon from 'autocannon'
import type { Knex } from 'knex'
import { openDatabase } from '../db/index'
import { seedHistory, type HistoryCounts } from '../db/seeds/history'
import { plainPart } from '../tests/fixtures/svg'
import type { ApiResponse } from '../utils/api-types'
import { startBuiltApp, type BuiltApp } from './lib/built-app'
import { startPostgres } from './lib/postgres-server'

const CONNECTIONS = 50
const DURATION_S = 10
const STORM_JOBS = 50
const PASSWORD = 'kerfbook-demo'
const DAY_MS = 86_400_000
const SERVER_ENV = { SIGN_IN_LIMIT_PER_MINUTE: '1000' }

const { values } = parseArgs({
  options: {
    build: { type: 'boolean', default: false },
    jobs: { type: 'string', default: '2000' },
    days: { type: 'string', default: '365' },
    seed: { type: 'string', default: '20261204' },
    'no-sqlite': { type: 'boolean', default: false },
  },
})

/** What must be undone at the end, newest first: servers, the PostgreSQL cluster, temporary folders. */
const cleanups: (() => unknown)[] = []
async function cleanUp(count = cleanups.length): Promise<void> {
  for (let i = 0; i < count && cleanups.length; i++) {
    try {
      await cleanups.pop()!()
    } catch (error) {
      console.error('While cleaning up:', error)
    }
  }
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

// /proc counts CPU time in clock ticks of 1/100 s (USER_HZ, 100 on Linux).
const TICKS_PER_S = 100

/** CPU seconds each process has used so far (user + system), from /proc; processes gone meanwhile are left out. */
function processCpuSeconds(pids: number[]): Map<number, number> {
  const used = new Map<number, number>()
  for (const pid of pids) {
    try {
      // The fields after the command name (which may hold spaces) start at field 3; utime and stime are fields 14 and 15.
      const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1]!.split(' ')
      used.set(pid, (Number(fields[11]) + Number(fields[12])) / TICKS_PER_S)
    } catch {
      // The process ended between listing and reading.
    }
  }
  return used
}

/** The PostgreSQL server listening on `port`: its postmaster and every process it started (backends, writers). */
function postgresPids(port: number): number[] {
  const all = readdirSync('/proc').filter((name) => /^\d+$/.test(name)).map(Number)
  const postmaster = all.find((pid) => {
    try {
      const args = readFileSync(`/proc/${pid}/cmdline`, 'utf8').split('\0')
      return args[0]!.endsWith('/postgres') && args.includes(`port=${port}`)
    } catch {
      return false
    }
  })
  if (postmaster === undefined) return []
  return [postmaster, ...all.filter((pid) => {
    try {
      return Number(readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1]!.split(' ')[1]) === postmaster
    } catch {
      return false
    }
  })]
}

/** The machine's busy and total CPU seconds so far, over all cores, from /proc/stat. */
function machineCpuSeconds(): { busy: number; total: number } {
  const [, ...ticks] = readFileSync('/proc/stat', 'utf8').split('\n')[0]!.trim().split(/\s+/)
  const numbers = ticks.slice(0, 8).map(Number)
  const total = numbers.reduce((sum, n) => sum + n, 0)
  const idle = numbers[3]! + numbers[4]!
  return { busy: (total - idle) / TICKS_PER_S, total: total / TICKS_PER_S }
}

/** Named processes whose CPU use is shown beside each phase. */
type ProcessGroup = { name: string; pids: () => number[] }

/** Measures how busy each group, this process (the load generator) and the whole machine were while `run` ran. */
async function withCpu<T>(groups: ProcessGroup[], run: () => Promise<T>): Promise<{ result: T; cpu: string }> {
  const startedMs = performance.now()
  const before = { groups: groups.map((g) => processCpuSeconds(g.pids())), self: process.cpuUsage(), machine: machineCpuSeconds() }
  const result = await run()
  const wallS = (performance.now() - startedMs) / 1000
  const self = process.cpuUsage(before.self)
  const machine = machineCpuSeconds()
  const percent = (seconds: number) => `${Math.round((100 * seconds) / wallS)}%`
  const parts = groups.map((g, i) => {
    let seconds = 0
    // A process started during the run (a new pooled connection's backend) counts from zero.
    for (const [pid, used] of processCpuSeconds(g.pids())) seconds += used - (before.groups[i]!.get(pid) ?? 0)
    return `${g.name} ${percent(seconds)}`
  })
  parts.push(`load ${percent((self.user + self.system) / 1e6)}`)
  const machineBusy = (machine.busy - before.machine.busy) / (machine.total - before.machine.total)
  parts.push(`machine ${Math.round(machineBusy * 100)}% of ${cpus().length}`)
  return { result, cpu: parts.join(' ') }
}

const rows: string[] = []
function report(label: string, result: autocannon.Result, cpu: string): void {
  const statuses = Object.entries(result.statusCodeStats ?? {})
    .map(([status, { count }]) => `${status}×${count}`)
    .join(' ')
  const problems = [result.errors ? `errors ${result.errors}` : '', result.timeouts ? `timeouts ${result.timeouts}` : ''].filter(Boolean).join(' ')
  const row = `${label.padEnd(44)} ${result.requests.average.toFixed(0).padStart(6)} ${String(result.latency.p50).padStart(6)} ${String(result.latency.p99).padStart(7)}   ${`${statuses}${problems ? ` ${problems}` : ''}`.padEnd(18)} ${cpu}`
  rows.push(row)
  console.log(row)
}
const HEADER = `${'what'.padEnd(44)} ${'req/s'.padStart(6)} ${'p50 ms'.padStart(6)} ${'p99 ms'.padStart(7)}   ${'statuses'.padEnd(18)} CPU while it ran`

interface ReadTargets {
  /** The member with the most jobs in the history. */
  memberEmail: string
  cutterId: number
}

/** Seeds the history into a freshly seeded demo database and picks the member and cutter the reads use. */
async function seedWithTargets(db: Knex, into: { counts?: HistoryCounts; seconds?: number; targets?: ReadTargets }): Promise<void> {
  const started = performance.now()
  into.counts = await seedHistory(db, { jobs: Number(values.jobs), days: Number(values.days), seed: Number(values.seed) })
  into.seconds = (performance.now() - started) / 1000
  const busiest = await db('jobs as j').join('users as u', 'u.id', 'j.member_id').where('u.email', 'like', '%@history.example.test').groupBy('u.email').orderByRaw('count(*) desc').orderBy('u.email').first('u.email')
  const cutter = await db('cutters').orderBy('id').first('id')
  into.targets = { memberEmail: busiest.email, cutterId: Number(cutter.id) }
}

/** The calendar over two weeks back and two ahead, and the member's first page of jobs. */
function readPaths(cutterId: number): { calendar: string; jobs: string } {
  const from = new Date(Date.now() - 14 * DAY_MS).toISOString()
  const to = new Date(Date.now() + 14 * DAY_MS).toISOString()
  return { calendar: `/api/bookings?cutter=${cutterId}&from=${encodeURIComponent(from)}&to=${encodeURIComponent(to)}`, jobs: '/api/jobs?limit=50' }
}

/**
 * autocannon deals its connections out in turn over several URLs ("More than one URL is allowed", its README);
 * its type declarations still say one string.
 */
function targets(servers: BuiltApp[], path = ''): string {
  return servers.map((s) => s.baseUrl + path) as unknown as string
}

type LoadBounds = { duration: number } | { amount: number }

/** A fixed load of GET requests on `path`; with several servers the connections are dealt out among them in turn. */
function readLoad(servers: BuiltApp[], cookie: string, path: string, bounds: LoadBounds = { duration: DURATION_S }): Promise<autocannon.Result> {
  return autocannon({ url: targets(servers, path), connections: CONNECTIONS, headers: { cookie }, ...bounds })
}

async function warmUp(servers: BuiltApp[], cookie: string, paths: string[]): Promise<void> {
  for (const path of paths) await readLoad(servers, cookie, path, { amount: 300 })
}

async function main(): Promise<void> {
  if (values.build || !existsSync('.output/server/index.mjs')) {
    console.error('Building the app (nuxt build)…')
    execSync('npx nuxt build', { stdio: ['ignore', 'ignore', 'inherit'] })
  }
  // A private copy, so a rebuild of .output during the run cannot pull chunks from under the servers.
  const copyDir = mkdtempSync(join(tmpdir(), 'kerfbook-bench-two-output-'))
  cleanups.push(() => rmSync(copyDir, { recursive: true, force: true }))
  cpSync('.output', copyDir, { recursive: true })

  console.log(`Kerfbook, two app servers on one PostgreSQL database, ${new Date().toISOString()}`)
  console.log(`Machine: ${cpus().length} CPUs (${cpus()[0]?.model.trim()}), ${(totalmem() / 1024 ** 3).toFixed(1)} GB memory, Node ${process.version}, load average ${loadavg().map((n) => n.toFixed(1)).join(' ')} before the run`)

  const postgres = await startPostgres('kerfbook-bench-two-pg')
  cleanups.push(() => postgres.stop())
  const seeded: { counts?: HistoryCounts; seconds?: number; targets?: ReadTargets } = {}
  const first = await startBuiltApp({ name: 'kerfbook-bench-two-a', outputDir: copyDir, postgresUrl: postgres.url, env: SERVER_ENV, prepare: (db) => seedWithTargets(db, seeded) })
  cleanups.push(() => first.stop())
  const second = await startBuiltApp({ name: 'kerfbook-bench-two-b', outputDir: copyDir, sharedDatabase: first.databaseLocation, sessionPassword: first.sessionPassword, env: SERVER_ENV })
  cleanups.push(() => second.stop())
  const both = [first, second]
  const measured: ProcessGroup[] = [{ name: 'A', pids: () => [first.pid] }, { name: 'B', pids: () => [second.pid] }, { name: 'PG', pids: () => postgresPids(postgres.port) }]
  const { memberEmail, cutterId } = seeded.targets!
  console.log(`History: ${Object.entries(seeded.counts!).map(([k, v]) => `${v} ${k}`).join(', ')} over ${values.days} days (seeded in ${seeded.seconds!.toFixed(1)} s)`)

  // One sign-in on A; B reads the same cookie, since both seal sessions with the same key.
  const member = await signIn(first.baseUrl, memberEmail)
  const onSecond = await api<{ email: string }>(second.baseUrl, member, 'GET', '/api/me')
  if (onSecond.email !== memberEmail) throw new Error(`B took A's session cookie for ${onSecond.email}, not ${memberEmail}`)
  const memberJobs = await api<{ items: unknown[] }>(first.baseUrl, member, 'GET', '/api/jobs?limit=50')
  console.log(`Reads as ${memberEmail} (signed in on A, the same cookie on B); job list page: ${memberJobs.items.length} jobs`)

  // The storm: one member's approved jobs, all asking for the same slot.
  const stormMember = await signIn(first.baseUrl, 'member@example.test')
  const staff = await signIn(first.baseUrl, 'staff@example.test')
  const overview = await api<ApiResponse<'/api/catalog/overview'>>(first.baseUrl, stormMember, 'GET', '/api/catalog/overview')
  const heron = overview.find((c) => c.name.startsWith('Heron'))!
  const materialId = heron.materials.find((m) => m.name === 'Birch plywood')!.materialId
  console.log(`Preparing ${STORM_JOBS} approved jobs for the booking race…`)
  const stormJobs: number[] = []
  for (let i = 0; i < STORM_JOBS; i++) {
    const job = await api<ApiResponse<'/api/jobs', 'post'>>(first.baseUrl, stormMember, 'POST', '/api/jobs', { title: `Race job ${i}`, cutterId: heron.cutterId, materialId })
    const form = new FormData()
    form.set('file', new Blob([plainPart()], { type: 'image/svg+xml' }), 'part.svg')
    await api(first.baseUrl, stormMember, 'POST', `/api/jobs/${job.id}/files`, form)
    await api(first.baseUrl, stormMember, 'POST', `/api/jobs/${job.id}/submit`, {})
    await api(first.baseUrl, staff, 'POST', `/api/jobs/${job.id}/approve`, {})
    stormJobs.push(job.id)
  }
  const { slots } = await api<ApiResponse<'/api/bookings/suggestions'>>(first.baseUrl, stormMember, 'GET', `/api/bookings/suggestions?jobId=${stormJobs[0]}`)
  const slotStart = slots[0]!.start

  const paths = readPaths(cutterId)
  await warmUp(both, member, [paths.calendar, paths.jobs])
  console.log(`\n${CONNECTIONS} connections, ${DURATION_S} s a read phase (two servers: connections dealt out in turn, ${CONNECTIONS / 2} each)`)
  console.log(`CPU: % of one core for A, B, PostgreSQL (PG) and this process ("load", which sends the requests); "machine" is every core's use by anything.\n`)
  console.log(HEADER)
  for (const [name, path] of [['calendar, 4 weeks', paths.calendar], ['member job list, first 50', paths.jobs]] as const) {
    const alone = await withCpu(measured, () => readLoad([first], member, path))
    report(`PG, A alone: ${name}`, alone.result, alone.cpu)
    const spread = await withCpu(measured, () => readLoad(both, member, path))
    report(`PG, A + B: ${name}`, spread.result, spread.cpu)
  }

  // Every connection sends one booking for the same slot with a job of its own, alternately to A and B.
  let nextJob = 0
  const storm = await withCpu(measured, () =>
    autocannon({
      url: targets(both),
      connections: STORM_JOBS,
      amount: STORM_JOBS,
      headers: { cookie: stormMember, 'content-type': 'application/json' },
      requests: [{ method: 'POST', path: '/api/bookings', setupRequest: (request) => ({ ...request, body: JSON.stringify({ jobId: stormJobs[nextJob++], cutterId: heron.cutterId, start: slotStart }) }) }],
    }),
  )
  report(`PG, A + B: ${STORM_JOBS} bookings race for one slot`, storm.result, storm.cpu)
  const db = openDatabase(first.databaseLocation)
  let booked: number
  let clashes: number
  try {
    booked = Number((await db('bookings').whereIn('job_id', stormJobs).whereNot('status', 'cancelled').count({ n: '*' }).first())!.n)
    clashes = Number(
      (await db('bookings as a')
        .join('bookings as b', function () {
          this.on('a.cutter_id', 'b.cutter_id').andOn('a.id', '<', 'b.id').andOn('a.starts_at', '<', 'b.ends_at').andOn('a.ends_at', '>', 'b.starts_at')
        })
        .whereNot('a.status', 'cancelled')
        .whereNot('b.status', 'cancelled')
        .count({ n: '*' })
        .first())!.n,
    )
  } finally {
    await db.destroy()
  }
  const created = storm.result.statusCodeStats?.['201']?.count ?? 0
  const refused = storm.result.statusCodeStats?.['409']?.count ?? 0
  const raceLine = `Race: ${created} × 201, ${refused} × 409 of ${STORM_JOBS}; in the database ${booked} booking for those jobs, ${clashes} overlapping pairs anywhere`
  rows.push(raceLine)
  console.log(raceLine)

  // B, A and PostgreSQL stop before the reference server starts, so nothing else runs beside it.
  await cleanUp(3)

  if (!values['no-sqlite']) {
    // The reference: one server on SQLite with the same history and the same reads.
    const reference: { counts?: HistoryCounts; seconds?: number; targets?: ReadTargets } = {}
    const single = await startBuiltApp({ name: 'kerfbook-bench-two-sqlite', outputDir: copyDir, env: SERVER_ENV, prepare: (db) => seedWithTargets(db, reference) })
    cleanups.push(() => single.stop())
    const sqliteMember = await signIn(single.baseUrl, reference.targets!.memberEmail)
    const sqlitePaths = readPaths(reference.targets!.cutterId)
    await warmUp([single], sqliteMember, [sqlitePaths.calendar, sqlitePaths.jobs])
    for (const [name, path] of [['calendar, 4 weeks', sqlitePaths.calendar], ['member job list, first 50', sqlitePaths.jobs]] as const) {
      const alone = await withCpu([{ name: 'app', pids: () => [single.pid] }], () => readLoad([single], sqliteMember, path))
      report(`SQLite, one server: ${name}`, alone.result, alone.cpu)
    }
  }

  console.log(`\n${HEADER}\n${rows.join('\n')}`)
  if (created !== 1 || booked !== 1 || clashes !== 0) throw new Error(`The race booked ${created} times (${booked} in the database, ${clashes} overlaps), not exactly once`)
}

let exitCode = 0
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.once(signal, () => {
    console.error(`\n${signal}: stopping the servers…`)
    void cleanUp().then(() => process.exit(130))
  })
}
try {
  await main()
} catch (error) {
  console.error(error)
  exitCode = 1
} finally {
  await cleanUp()
}
process.exit(exitCode)
