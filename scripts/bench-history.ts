// `npm run bench:history [-- --jobs 10000 --build --postgres]`: every list and report on a busy workshop's years of history.
// Starts the built server (.output; `--build` or a missing build runs `nuxt build` first) on loopback with the
// demo workshop plus `db:seed-history`'s invented history (in a SQLite file, or with `--postgres` in a database on a
// throwaway PostgreSQL server started for the run and stopped after it), then reads each list page and each report over 731
// days through the HTTP API as staff, an admin or a member would: one warm-up, then the median and the worst of
// a few timed reads, the status and the size of the answer. Ends by itself; prints a table.
import { execSync } from 'node:child_process'
import { cpSync, existsSync, mkdtempSync, rmSync } from 'node:fs'
import { cpus, tmpdir } from 'node:os'
import { join } from 'node:path'
import { parseArgs } from 'node:util'
import { DateTime } from 'luxon'
import { seedHistory, type HistoryCounts } from '../db/seeds/history'
import { describeLocation } from '../db/knexfile'
import { startBuiltApp, type BuiltApp } from './lib/built-app'
import { startPostgres, type PostgresServer } from './lib/postgres-server'

const PASSWORD = 'kerfbook-demo'
const TIMED_READS = 3
const DAYS = 731

const { values } = parseArgs({ options: { jobs: { type: 'string', default: '10000' }, build: { type: 'boolean', default: false }, seed: { type: 'string', default: '20261204' }, postgres: { type: 'boolean', default: false } } })

async function signIn(baseUrl: string, email: string): Promise<string> {
  const response = await fetch(`${baseUrl}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: PASSWORD }) })
  if (response.status !== 200) throw new Error(`sign-in as ${email}: ${response.status}`)
  return response.headers.getSetCookie()[0]!.split(';')[0]!
}

interface Reading {
  status: number
  ms: number
  bytes: number
  rows: string
}

async function read(baseUrl: string, cookie: string, path: string): Promise<Reading> {
  const started = performance.now()
  const response = await fetch(baseUrl + path, { headers: { cookie } })
  const text = await response.text()
  const ms = performance.now() - started
  let rows = ''
  try {
    const body = JSON.parse(text)
    const list = Array.isArray(body) ? body : (body.items ?? body.rows ?? body.entries ?? body.events)
    if (Array.isArray(list)) rows = `${list.length}${body.nextCursor ? ' +more' : ''}`
  } catch {
    rows = `${text.split('\n').length - 1} lines`
  }
  return { status: response.status, ms, bytes: Buffer.byteLength(text), rows }
}

const kb = (bytes: number) => (bytes >= 1024 * 1024 ? `${(bytes / 1024 / 1024).toFixed(1)} MB` : `${(bytes / 1024).toFixed(1)} kB`)

async function main(): Promise<void> {
  if (values.build || !existsSync('.output/server/index.mjs')) {
    console.error('Building the app (nuxt build)…')
    execSync('npx nuxt build', { stdio: ['ignore', 'ignore', 'inherit'] })
  }
  // A private copy, so a rebuild of .output during the run cannot pull chunks from under the server.
  const copyDir = mkdtempSync(join(tmpdir(), 'kerfbook-bench-history-output-'))
  cpSync('.output', copyDir, { recursive: true })
  const jobs = Number(values.jobs)
  let counts: HistoryCounts | undefined
  let seedSeconds = 0
  const picks = { member: '', jobId: 0, runSheetDay: '', cutterId: 0 }
  let postgres: PostgresServer | undefined
  let app: BuiltApp | undefined
  try {
    if (values.postgres) {
      const server = await startPostgres('kerfbook-bench-history-pg')
      postgres = server
      // Interrupted, the throwaway server stops too rather than run on in the background.
      for (const signal of ['SIGINT', 'SIGTERM'] as const) process.once(signal, () => {
        server.stop()
        process.exit(130)
      })
    }
    app = await startBuiltApp({
      name: 'kerfbook-bench-history',
      outputDir: copyDir,
      env: { SIGN_IN_LIMIT_PER_MINUTE: '1000' },
      postgresUrl: postgres?.url,
      async prepare(db) {
        const started = performance.now()
        counts = await seedHistory(db, { jobs, days: DAYS, seed: Number(values.seed) })
        seedSeconds = (performance.now() - started) / 1000
        // The busiest member, the job with the longest history, and the busiest day ahead on the first cutter.
        picks.member = (await db('bookings as b').join('users as u', 'u.id', 'b.member_id').groupBy('u.email').orderByRaw('count(*) desc').first('u.email')).email
        picks.jobId = (await db('job_events').groupBy('job_id').orderByRaw('count(*) desc').first('job_id')).job_id
        picks.cutterId = (await db('cutters').orderBy('id').first('id')).id
        const zone = JSON.parse((await db('settings').where({ key: 'timeZone' }).first('value_json')).value_json)
        const ahead = await db('bookings').where({ cutter_id: picks.cutterId, status: 'confirmed', kind: 'job' }).where('starts_at', '>', new Date().toISOString()).select('starts_at')
        const perDay = new Map<string, number>()
        for (const b of ahead) {
          const day = DateTime.fromISO(b.starts_at, { zone }).toISODate()!
          perDay.set(day, (perDay.get(day) ?? 0) + 1)
        }
        picks.runSheetDay = [...perDay].sort((a, b) => b[1] - a[1])[0]?.[0] ?? DateTime.now().setZone(zone).toISODate()!
      },
    })
    const staff = await signIn(app.baseUrl, 'staff@example.test')
    const admin = await signIn(app.baseUrl, 'admin@example.test')
    const member = await signIn(app.baseUrl, picks.member)
    const today = DateTime.now().toISODate()!
    const from = DateTime.now().minus({ days: DAYS }).toISODate()!
    const week = { from: DateTime.now().startOf('week').toUTC().toISO()!, to: DateTime.now().startOf('week').plus({ weeks: 1 }).toUTC().toISO()! }
    const page = 'limit=50'
    const cases: [string, string, string][] = [
      ['staff: every job (first page)', staff, `/api/jobs?scope=all&${page}`],
      ['staff: review queue', staff, `/api/jobs?scope=all&state=submitted&${page}`],
      ['staff: members', staff, `/api/staff/members?${page}`],
      ['admin: accounts', admin, `/api/admin/users?${page}`],
      ['admin: payments, all', admin, `/api/admin/payments?${page}`],
      ['admin: payments, captured', admin, `/api/admin/payments?state=captured&${page}`],
      ['admin: payments as CSV (all rows)', admin, '/api/admin/payments?format=csv'],
      ['member: my payments', member, `/api/me/payments?${page}`],
      ['member: my jobs', member, `/api/jobs?${page}`],
      ['staff: mail outbox', staff, `/api/staff/mail-outbox?${page}`],
      ['staff: job page (with history)', staff, `/api/jobs/${picks.jobId}`],
      ['staff: job history', staff, `/api/jobs/${picks.jobId}/events?${page}`],
      [`staff: run sheet ${picks.runSheetDay}`, staff, `/api/run-sheet?cutter=${picks.cutterId}&date=${picks.runSheetDay}`],
      ['staff: calendar, this week', staff, `/api/bookings?cutter=${picks.cutterId}&from=${encodeURIComponent(week.from)}&to=${encodeURIComponent(week.to)}`],
      ['member: calendar, this week', member, `/api/bookings?cutter=${picks.cutterId}&from=${encodeURIComponent(week.from)}&to=${encodeURIComponent(week.to)}`],
      ...['utilisation', 'revenue', 'minutes-by-member', 'materials', 'jobs-by-state', 'turnaround', 'estimate-accuracy', 'estimate-points'].map(
        (name): [string, string, string] => [`report: ${name}, ${DAYS} days`, staff, `/api/reports/${name}?from=${from}&to=${today}`],
      ),
    ]
    console.log(`Kerfbook history benchmark, ${new Date().toISOString()}, ${cpus().length} CPUs, Node ${process.version}`)
    console.log(`Database: ${postgres ? 'PostgreSQL' : 'SQLite'}, ${describeLocation(app.databaseLocation)}`)
    console.log(`History: ${Object.entries(counts!).map(([k, v]) => `${v} ${k}`).join(', ')} (seeded in ${seedSeconds.toFixed(1)} s)`)
    console.log(`Each row: one warm-up read, then the median and the worst of ${TIMED_READS} timed reads.\n`)
    console.log(`${'what'.padEnd(40)} ${'status'.padStart(6)} ${'median'.padStart(9)} ${'worst'.padStart(9)} ${'size'.padStart(10)}  rows`)
    let over = 0
    for (const [label, cookie, path] of cases) {
      const readings: Reading[] = []
      await read(app.baseUrl, cookie, path)
      for (let i = 0; i < TIMED_READS; i++) readings.push(await read(app.baseUrl, cookie, path))
      const times = readings.map((r) => r.ms).sort((a, b) => a - b)
      const last = readings.at(-1)!
      if (times.at(-1)! > 500 || last.status >= 500) over++
      console.log(`${label.padEnd(40)} ${String(last.status).padStart(6)} ${`${times[times.length >> 1]!.toFixed(1)} ms`.padStart(9)} ${`${times.at(-1)!.toFixed(1)} ms`.padStart(9)} ${kb(last.bytes).padStart(10)}  ${last.rows}`)
    }
    console.log(`\n${over ? `${over} reads over 500 ms or failed with a 5xx` : 'Every read within 500 ms, no 5xx'}.`)
  } finally {
    await app?.stop()
    postgres?.stop()
    rmSync(copyDir, { recursive: true, force: true })
  }
}

await main()
