// A member's large fold pattern through the whole app: `npm run bench:fold -- [options]` (`--help` lists them).
// Builds once when .output is missing, runs a private copy of it on loopback with a fresh demo database
// (scripts/lib/built-app.ts), signs a new member up and in through the API, creates a job on the demo laser
// with 3 mm birch plywood and uploads a generated fold sheet (scripts/lib/fold-sheet.ts), whose every hinge
// is narrower than the plywood allows by design. Then it measures what the member and the staff wait for:
// upload and analysis, stored bytes, the job list, job detail, preview data routes, the review queue, the
// server-rendered job page, the job page in headless Chromium (preview ready, zoom step, heap, DOM), and
// four members uploading at once while a fifth reads the calendar. Every step has a time limit and reports
// "> N s" or its error instead of hanging; the whole run stops by itself.
import { spawnSync } from 'node:child_process'
import { cpSync, existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs'
import { request as httpRequest } from 'node:http'
import { cpus, loadavg, tmpdir, totalmem } from 'node:os'
import { join } from 'node:path'
import { parseArgs } from 'node:util'
import { brotliDecompressSync, gunzipSync, inflateSync } from 'node:zlib'
import Database from 'better-sqlite3'
import { chromium, type Browser, type Page } from 'playwright-core'
import { type BuiltApp, startBuiltApp } from './lib/built-app'
import { foldSheet } from './lib/fold-sheet'

const PASSWORD = 'kerfbook-demo'
const NEW_MEMBER_PASSWORD = 'fold-bench-password'
const CHROMIUM_PATH = '/usr/bin/chromium'
// As the browser tests run it (tests/browser/browser.ts): no GPU, nothing leaves the machine.
const CHROMIUM_ARGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run']
const PARTS = ['upload', 'api', 'page', 'browser', 'load'] as const
type Part = (typeof PARTS)[number]

const HELP = `Usage: npm run bench:fold -- [options]

  --units N              units across and down [150]
  --across N, --down N   units across / down separately
  --pitch MM             panel side [20]
  --non-repeating        jitter every unit's dimensions (deterministic; --seed N, default 1)
  --parts LIST           comma-separated, of: ${PARTS.join(', ')} [all]
                         (api, page and browser need the upload and run it themselves)
  --members N            members uploading at once in the load part [4]
  --step-timeout S       limit of one request or step [180]
  --upload-timeout S     limit of one upload with its analysis [900]
  --preview-timeout S    limit for the browser's preview to be ready [300]
  --settle S             how long after the load to read the server's memory again [30]
  --max-minutes M        the whole run stops after this long [90]
  --rebuild              build .output even if it exists
  --save-svg FILE        also write the pattern to FILE
`

interface Options {
  across: number
  down: number
  pitchMm: number
  seed: number | undefined
  parts: Set<Part>
  members: number
  stepMs: number
  uploadMs: number
  previewMs: number
  settleMs: number
  maxMs: number
  rebuild: boolean
  saveSvg: string | undefined
}

function readOptions(argv: string[]): Options {
  const { values } = parseArgs({
    args: argv,
    options: {
      help: { type: 'boolean', short: 'h' },
      units: { type: 'string' },
      across: { type: 'string' },
      down: { type: 'string' },
      pitch: { type: 'string' },
      'non-repeating': { type: 'boolean' },
      seed: { type: 'string' },
      parts: { type: 'string' },
      members: { type: 'string' },
      'step-timeout': { type: 'string' },
      'upload-timeout': { type: 'string' },
      'preview-timeout': { type: 'string' },
      settle: { type: 'string' },
      'max-minutes': { type: 'string' },
      rebuild: { type: 'boolean' },
      'save-svg': { type: 'string' },
    },
  })
  if (values.help) {
    process.stdout.write(HELP)
    process.exit(0)
  }
  const number = (text: string | undefined, fallback: number) => {
    if (text === undefined) return fallback
    const value = Number(text)
    if (!Number.isFinite(value) || value <= 0) throw new Error(`Not a positive number: ${text}`)
    return value
  }
  const units = number(values.units, 150)
  const parts = new Set((values.parts ?? PARTS.join(',')).split(',').map((p) => p.trim()) as Part[])
  for (const part of parts) if (!PARTS.includes(part)) throw new Error(`Unknown part "${part}"; parts are ${PARTS.join(', ')}`)
  if (parts.has('api') || parts.has('page') || parts.has('browser')) parts.add('upload')
  return {
    across: number(values.across, units),
    down: number(values.down, units),
    pitchMm: number(values.pitch, 20),
    seed: values['non-repeating'] || values.seed !== undefined ? number(values.seed, 1) : undefined,
    parts,
    members: number(values.members, 4),
    stepMs: number(values['step-timeout'], 180) * 1000,
    uploadMs: number(values['upload-timeout'], 900) * 1000,
    previewMs: number(values['preview-timeout'], 300) * 1000,
    settleMs: number(values.settle, 30) * 1000,
    maxMs: number(values['max-minutes'], 90) * 60_000,
    rebuild: values.rebuild === true,
    saveSvg: values['save-svg'],
  }
}

// ——— figures ———

const figures: [string, string][] = []
function figure(label: string, value: string): void {
  figures.push([label, value])
  console.log(`  ${label}: ${value}`)
}
function section(title: string): void {
  figures.push([`— ${title}`, ''])
  console.log(`\n${title}`)
}
/** Other work on the machine skews every figure: the 1, 5 and 15 minute load averages, said next to them. */
const loadText = () => loadavg().map((load) => load.toFixed(1)).join(' / ')

function printTable(): void {
  figures.push(['load average at the end (1 / 5 / 15 min)', `${loadText()} on ${cpus().length} CPUs`])
  const width = Math.max(...figures.map(([label]) => label.length))
  console.log('\n' + '═'.repeat(width + 30))
  for (const [label, value] of figures) console.log(value === '' ? label : `${label.padEnd(width)}  ${value}`)
  console.log('═'.repeat(width + 30))
}

const seconds = (ms: number) => (ms >= 10_000 ? `${(ms / 1000).toFixed(1)} s` : `${Math.round(ms)} ms`)
const megabytes = (bytes: number) => (bytes >= 1e6 ? `${(bytes / 1e6).toFixed(2)} MB` : bytes >= 1e3 ? `${(bytes / 1e3).toFixed(1)} kB` : `${bytes} B`)
const median = (values: number[]) => {
  const sorted = [...values].sort((a, b) => a - b)
  const middle = sorted.length >> 1
  return sorted.length % 2 ? sorted[middle]! : (sorted[middle - 1]! + sorted[middle]!) / 2
}
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms))

class StepTimeout extends Error {
  constructor(readonly limitMs: number, what: string) {
    super(`${what}: no answer within ${limitMs / 1000} s`)
  }
}

/** The promise's value, or a StepTimeout once `limitMs` has passed (the work itself may go on). */
async function within<T>(limitMs: number, what: string, promise: Promise<T>): Promise<T> {
  let timer: NodeJS.Timeout | undefined
  try {
    return await Promise.race([promise, new Promise<never>((_, reject) => (timer = setTimeout(() => reject(new StepTimeout(limitMs, what)), limitMs)))])
  } finally {
    clearTimeout(timer)
  }
}

/** Runs a step; a failure or time-out becomes a figure and the run goes on. Returns undefined then. */
async function step<T>(label: string, run: () => Promise<T>): Promise<T | undefined> {
  try {
    return await run()
  } catch (error) {
    figure(label, error instanceof StepTimeout ? `> ${error.limitMs / 1000} s (stopped waiting)` : `FAILED: ${(error as Error).message.slice(0, 300)}`)
    return undefined
  }
}

// ——— HTTP ———

interface Answer {
  status: number
  ms: number
  /** Bytes on the wire (compressed when the server compressed). */
  wireBytes: number
  /** Bytes of the body after decompression. */
  bodyBytes: number
  encoding: string
  contentType: string
  body: Buffer
  setCookies: string[]
}

/** One request over plain node:http, as a browser would send it (compression accepted), timed to the last byte. */
function send(
  baseUrl: string,
  method: string,
  path: string,
  options: { cookie?: string; body?: string | Buffer; contentType?: string; accept?: string; timeoutMs: number },
): Promise<Answer> {
  return new Promise((resolve, reject) => {
    const started = performance.now()
    const headers: Record<string, string | number> = { accept: options.accept ?? 'application/json', 'accept-encoding': 'gzip, deflate, br' }
    if (options.cookie) headers.cookie = options.cookie
    if (options.body !== undefined) {
      headers['content-type'] = options.contentType ?? 'application/json'
      headers['content-length'] = Buffer.byteLength(options.body)
    }
    const request = httpRequest(baseUrl + path, { method, headers }, (response) => {
      const chunks: Buffer[] = []
      response.on('data', (chunk: Buffer) => chunks.push(chunk))
      response.on('error', reject)
      response.on('end', () => {
        const ms = performance.now() - started
        clearTimeout(timer)
        const raw = Buffer.concat(chunks)
        const encoding = String(response.headers['content-encoding'] ?? '')
        let body = raw
        try {
          body = encoding === 'gzip' ? gunzipSync(raw) : encoding === 'br' ? brotliDecompressSync(raw) : encoding === 'deflate' ? inflateSync(raw) : raw
        } catch {
          // Measured as sent.
        }
        const setCookie = response.headers['set-cookie'] ?? []
        resolve({ status: response.statusCode ?? 0, ms, wireBytes: raw.length, bodyBytes: body.length, encoding, contentType: String(response.headers['content-type'] ?? ''), body, setCookies: setCookie })
      })
    })
    const timer = setTimeout(() => request.destroy(new StepTimeout(options.timeoutMs, `${method} ${path}`)), options.timeoutMs)
    request.on('error', (error) => {
      clearTimeout(timer)
      reject(error)
    })
    if (options.body !== undefined) request.write(options.body)
    request.end()
  })
}

/** A signed-in actor: keeps its session cookie like a browser. */
class Actor {
  cookie = ''
  constructor(readonly baseUrl: string, readonly name: string, private readonly stepMs: number) {}

  async call(method: string, path: string, body?: unknown, timeoutMs = this.stepMs): Promise<Answer> {
    const answer = await send(this.baseUrl, method, path, { cookie: this.cookie, body: body === undefined ? undefined : JSON.stringify(body), timeoutMs })
    for (const setCookie of answer.setCookies) {
      const pair = setCookie.split(';')[0]!
      this.cookie = pair.endsWith('=') ? '' : pair
    }
    return answer
  }

  /** JSON of a 2xx answer, or an error naming the route and what the server said. */
  async json<T = any>(method: string, path: string, body?: unknown, timeoutMs?: number): Promise<T> {
    const answer = await this.call(method, path, body, timeoutMs)
    const text = answer.body.toString('utf8')
    if (answer.status >= 400) throw new Error(`${method} ${path} as ${this.name}: ${answer.status} ${text.slice(0, 300)}`)
    return (text ? JSON.parse(text) : undefined) as T
  }

  /** A multipart upload of one file, as the job page sends it. */
  async upload(path: string, svg: string, filename: string, timeoutMs: number): Promise<Answer> {
    const form = new FormData()
    form.set('file', new Blob([svg], { type: 'image/svg+xml' }), filename)
    const encoded = new Response(form)
    const body = Buffer.from(await encoded.arrayBuffer())
    return send(this.baseUrl, 'POST', path, { cookie: this.cookie, body, contentType: encoded.headers.get('content-type')!, timeoutMs })
  }
}

async function signIn(app: BuiltApp, email: string, password: string, stepMs: number): Promise<Actor> {
  const actor = new Actor(app.baseUrl, email, stepMs)
  await actor.json('POST', '/api/auth/sign-in', { email, password })
  if (!actor.cookie) throw new Error(`sign-in as ${email} set no session cookie`)
  return actor
}

/** Sign-up, the confirmation link from the mail sink, then sign-in: the flow of tests/api/auth.test.ts. */
async function newMember(app: BuiltApp, label: string, stepMs: number): Promise<Actor> {
  const email = `${label}-${Date.now()}-${Math.floor(Math.random() * 1e6)}@example.test`
  const visitor = new Actor(app.baseUrl, email, stepMs)
  await visitor.json('POST', '/api/auth/sign-up', { name: `Fold bench ${label}`, email, password: NEW_MEMBER_PASSWORD })
  const deadline = Date.now() + 15_000
  let token: string | undefined
  while (!token && Date.now() < deadline) {
    const messages = (await (await fetch(`${app.outboxUrl}/messages`)).json()) as { to: string[]; subject: string; text: string }[]
    const mail = messages.find((m) => m.to.includes(email) && /Confirm your e-mail/.test(m.subject))
    token = mail?.text.match(/\/verify\?token=([A-Za-z0-9_-]+)/)?.[1]
    if (!token) await sleep(100)
  }
  if (!token) throw new Error(`no confirmation mail for ${email} within 15 s`)
  await visitor.json('POST', '/api/auth/verify', { token })
  return signIn(app, email, NEW_MEMBER_PASSWORD, stepMs)
}

// ——— the database, read as it is (before or after a change of schema) ———

type Db = InstanceType<typeof Database>
const quote = (name: string) => `"${name.replaceAll('"', '""')}"`
const columnsOf = (db: Db, table: string) => db.prepare(`PRAGMA table_info(${quote(table)})`).all() as { name: string; type: string }[]
const tablesOf = (db: Db) => (db.prepare(`SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' AND name NOT LIKE 'knex_%'`).all() as { name: string }[]).map((t) => t.name)

/** Columns that hold a revision's analysis, preview or findings, whatever they are called now. */
const STORED_COLUMN = /json|analysis|preview|geometry|sites|finding|group|payload|packed|blob|contour|summary|bytes$/i
const PENDING = new Set(['pending', 'queued', 'waiting', 'running', 'analysing', 'analyzing', 'processing'])

interface RevisionRef {
  fileId: number
  revision: number
  rowId: number
}

/** The job's newest file revision once its analysis is stored (a queued analysis counts as not yet). */
function analysedRevision(db: Db, jobId: number): RevisionRef | undefined {
  const row = db
    .prepare(`SELECT r.*, f.id AS bench_file_id FROM file_revisions r JOIN job_files f ON f.id = r.job_file_id WHERE f.job_id = ? AND f.removed_at IS NULL ORDER BY f.id DESC, r.revision DESC LIMIT 1`)
    .get(jobId) as Record<string, unknown> | undefined
  if (!row) return undefined
  for (const [column, value] of Object.entries(row)) {
    if (/(^|_)(state|status)$/.test(column) && typeof value === 'string' && PENDING.has(value.toLowerCase())) return undefined
    if (/^analysis/.test(column) && value === null) return undefined
  }
  return { fileId: row.bench_file_id as number, revision: row.revision as number, rowId: row.id as number }
}

/** The analysed revision, and whether it was stored already when the upload's answer came (the analysis ran inside the request). */
async function waitForAnalysis(databasePath: string, jobId: number, deadline: number): Promise<RevisionRef & { storedWithAnswer: boolean }> {
  const db = new Database(databasePath, { readonly: true, fileMustExist: true })
  try {
    for (let poll = 0; Date.now() < deadline; poll++) {
      const found = analysedRevision(db, jobId)
      if (found) return { ...found, storedWithAnswer: poll === 0 }
      await sleep(100)
    }
  } finally {
    db.close()
  }
  throw new Error(`the analysis of job ${jobId} was not stored in time`)
}

/** Bytes stored for one revision: its own large columns, and rows of other tables that point at it. */
function storedBytes(databasePath: string, revision: RevisionRef): { total: number; parts: [string, number][] } {
  const db = new Database(databasePath, { readonly: true, fileMustExist: true })
  try {
    const parts: [string, number][] = []
    const measure = (table: string, columns: string[], where: string, parameters: unknown[]) => {
      for (const column of columns) {
        const value = quote(column)
        const { bytes } = db
          .prepare(`SELECT coalesce(sum(CASE WHEN typeof(${value}) IN ('text', 'blob') THEN length(CAST(${value} AS BLOB)) ELSE 0 END), 0) AS bytes FROM ${quote(table)} WHERE ${where}`)
          .get(...parameters) as { bytes: number }
        if (bytes > 0) parts.push([`${table}.${column}`, bytes])
      }
    }
    // Every text or blob of the revision's row, whatever the columns are called now (names, hashes and dates add a few bytes).
    measure('file_revisions', columnsOf(db, 'file_revisions').map((c) => c.name), 'id = ?', [revision.rowId])
    for (const table of tablesOf(db)) {
      if (table === 'file_revisions') continue
      const columns = columnsOf(db, table)
      const names = new Set(columns.map((c) => c.name))
      const pointer = columns.find((c) => /^(file_)?revision_id$/.test(c.name))?.name
      const where = pointer ? `${quote(pointer)} = ?` : names.has('job_file_id') && names.has('revision') ? 'job_file_id = ? AND revision = ?' : undefined
      if (!where) continue
      const parameters = pointer ? [revision.rowId] : [revision.fileId, revision.revision]
      const payload = columns.filter((c) => c.name !== pointer && !/(^id|_id|_at)$/.test(c.name) && (/text|blob|json|char/i.test(c.type) || c.type === '' || STORED_COLUMN.test(c.name)))
      measure(table, payload.map((c) => c.name), where, parameters)
    }
    return { total: parts.reduce((sum, [, bytes]) => sum + bytes, 0), parts: parts.filter(([, bytes]) => bytes >= 1000) }
  } finally {
    db.close()
  }
}

function folderBytes(path: string): number {
  if (!existsSync(path)) return 0
  let total = 0
  for (const entry of readdirSync(path, { withFileTypes: true }))
    total += entry.isDirectory() ? folderBytes(join(path, entry.name)) : statSync(join(path, entry.name)).size
  return total
}

function rssKb(pid: number): number {
  const match = readFileSync(`/proc/${pid}/status`, 'utf8').match(/VmRSS:\s+(\d+)\s+kB/)
  return match ? Number(match[1]) : NaN
}
const rssText = (kb: number) => `${(kb / 1024).toFixed(0)} MB`

// ——— the parts ———

interface Context {
  app: BuiltApp
  options: Options
  svg: string
  filename: string
  cutterId: number
  materialId: number
  member?: Actor
  jobId?: number
  revision?: RevisionRef
}

/** Times GET `path` up to `times` times (fewer when one answer alone takes long) and reports the median. */
async function timedGets(context: Context, actor: Actor, label: string, path: string, times: number, accept?: string): Promise<Answer | undefined> {
  return step(label, async () => {
    const answers: Answer[] = []
    const started = Date.now()
    while (answers.length < times && (answers.length === 0 || Date.now() - started < 30_000)) {
      const answer = await send(context.app.baseUrl, 'GET', path, { cookie: actor.cookie, accept, timeoutMs: context.options.stepMs })
      answers.push(answer)
      if (answer.status >= 400) break
    }
    const last = answers.at(-1)!
    if (last.status >= 400) {
      figure(label, `HTTP ${last.status} ${last.body.toString('utf8').slice(0, 120)}`)
      return last
    }
    const size = last.encoding ? `${megabytes(last.bodyBytes)} (${megabytes(last.wireBytes)} ${last.encoding} on the wire)` : megabytes(last.bodyBytes)
    figure(label, `${seconds(median(answers.map((a) => a.ms)))} median of ${answers.length} (worst ${seconds(Math.max(...answers.map((a) => a.ms)))}), ${size}`)
    return last
  })
}

async function uploadPart(context: Context): Promise<void> {
  const { app, options } = context
  section(`Upload and analysis (${context.filename})`)
  const member = await step('member sign-up and sign-in', () => newMember(app, 'member', options.stepMs))
  if (!member) return
  const job = await step('create job', () => member.json<{ id: number }>('POST', '/api/jobs', { title: 'Fold sheet', cutterId: context.cutterId, materialId: context.materialId }))
  if (!job) return
  context.member = member
  context.jobId = job.id
  const started = performance.now()
  const answer = await step('upload', () => member.upload(`/api/jobs/${job.id}/files`, context.svg, context.filename, options.uploadMs))
  if (!answer) return
  if (answer.status >= 400) {
    figure('upload', `HTTP ${answer.status} ${answer.body.toString('utf8').slice(0, 200)}`)
    return
  }
  figure('upload answered', `HTTP ${answer.status} after ${seconds(answer.ms)}`)
  const revision = await step('analysis stored', () => waitForAnalysis(app.databaseLocation, job.id, Date.now() + options.uploadMs))
  if (!revision) return
  context.revision = revision
  figure('upload + analysis', revision.storedWithAnswer ? `${seconds(answer.ms)} (stored when the upload answered)` : seconds(performance.now() - started))
  const stored = storedBytes(app.databaseLocation, revision)
  figure('stored analysis (this revision)', `${megabytes(stored.total)}: ${stored.parts.map(([name, bytes]) => `${name} ${megabytes(bytes)}`).join(', ')}`)
  const databaseBytes = ['', '-wal'].reduce((sum, suffix) => sum + (existsSync(app.databaseLocation + suffix) ? statSync(app.databaseLocation + suffix).size : 0), 0)
  figure('server RSS after the upload', rssText(rssKb(app.pid)))
  figure('database file (+ WAL), uploads folder', `${megabytes(databaseBytes)}, ${megabytes(folderBytes(join(app.workDir, 'uploads')))}`)
}

async function apiPart(context: Context): Promise<void> {
  const { app, options, member, jobId, revision } = context
  if (!member || !jobId || !revision) return
  section('API, one member with the one large job')
  await timedGets(context, member, 'GET /api/jobs (member list)', '/api/jobs', 5)
  const detail = await timedGets(context, member, `GET /api/jobs/:id (detail)`, `/api/jobs/${jobId}`, 3)
  if (detail && detail.status < 400) {
    const findings = (JSON.parse(detail.body.toString('utf8')) as { findings?: Record<string, unknown> }).findings
    if (findings) figure('findings on the job', JSON.stringify(findings).slice(0, 200))
  }
  const base = `/api/jobs/${jobId}/files/${revision.fileId}/revisions/${revision.revision}`
  await timedGets(context, member, 'GET …/revisions/:n (preview data)', base, 3)
  for (const extra of ['geometry', 'sites']) {
    const probe = await step(`probe …/${extra}`, () => send(app.baseUrl, 'GET', `${base}/${extra}`, { cookie: member.cookie, accept: '*/*', timeoutMs: options.stepMs }))
    if (!probe) continue
    if (probe.status === 404 || probe.status === 405) figure(`GET …/revisions/:n/${extra}`, `absent (HTTP ${probe.status})`)
    else await timedGets(context, member, `GET …/revisions/:n/${extra}`, `${base}/${extra}`, 3, '*/*')
  }

  const staff = await step('staff sign-in', () => signIn(app, 'staff@example.test', PASSWORD, options.stepMs))
  if (!staff) return
  // The queue shows submitted jobs. The pattern is larger than the bed (an error) and its hinges are narrow on purpose
  // (warnings): staff record an override, as they would for a member who cuts it in tiles, and the member acknowledges.
  const submitted = await step('submit for review', async () => {
    const acknowledgement = { acknowledgement: 'The 1.5 mm hinges are meant to bend: it is a fold pattern.' }
    let answer = await member.call('POST', `/api/jobs/${jobId}/submit`, acknowledgement)
    if (answer.status >= 400) {
      await staff.json('POST', `/api/jobs/${jobId}/override`, { reason: 'Benchmark: cut in tiles, narrow hinges intended.' })
      answer = await member.call('POST', `/api/jobs/${jobId}/submit`, acknowledgement)
    }
    if (answer.status >= 400) throw new Error(`HTTP ${answer.status} ${answer.body.toString('utf8').slice(0, 200)}`)
    figure('submit for review', seconds(answer.ms))
    return true
  })
  await timedGets(context, staff, submitted ? 'GET /api/jobs?scope=all&state=submitted (staff queue)' : 'GET /api/jobs?scope=all (staff, all jobs)', submitted ? '/api/jobs?scope=all&state=submitted' : '/api/jobs?scope=all', 5)
}

async function pagePart(context: Context): Promise<void> {
  const { member, jobId } = context
  if (!member || !jobId) return
  section('Server-rendered page')
  await timedGets(context, member, 'GET /jobs/:id (HTML)', `/jobs/${jobId}`, 3, 'text/html')
}

/** Waits in the page until the preview is drawn: the canvas preview's ready state, or the SVG preview's paths. */
function previewReady(): 'canvas' | 'svg' | string | false {
  const root = document.querySelector('[data-preview-state]')
  const state = root?.getAttribute('data-preview-state')
  if (state && /error|fail/i.test(state)) return `preview state "${state}"`
  if (root) return state === 'ready' ? 'canvas' : false
  return document.querySelector('svg[aria-label^="Preview of the pattern"] path[d^="M"]') ? 'svg' : false
}

/** One zoom step in the page: the zoom-in button (or a wheel turn), timed until the next draw or painted frame. */
async function zoomStep(limitMs: number): Promise<number> {
  const root = document.querySelector('[data-preview-state]')
  const surface = root?.querySelector('canvas') ?? root ?? document.querySelector('svg[aria-label^="Preview of the pattern"]')
  const button = [...document.querySelectorAll('button')].find((b) => /zoom in/i.test(`${b.getAttribute('aria-label') ?? ''} ${b.getAttribute('title') ?? ''} ${b.textContent ?? ''}`))
  const drawsBefore = Number(root?.getAttribute('data-draw-count') ?? 0)
  const started = performance.now()
  const drawn = root
    ? new Promise<void>((resolve, reject) => {
        const observer = new MutationObserver(() => {
          if (Number(root.getAttribute('data-draw-count')) > drawsBefore) {
            observer.disconnect()
            resolve()
          }
        })
        observer.observe(root, { attributes: true, attributeFilter: ['data-draw-count'] })
        setTimeout(() => reject(new Error('no new draw after the zoom step')), limitMs)
      })
    : undefined
  if (button) button.click()
  else if (surface) {
    const box = surface.getBoundingClientRect()
    surface.dispatchEvent(new WheelEvent('wheel', { deltaY: -120, clientX: box.left + box.width / 2, clientY: box.top + box.height / 2, bubbles: true, cancelable: true }))
  } else throw new Error('no zoom-in button and no preview surface')
  // The SVG preview is redrawn by Vue before the next frame; the task after that frame runs once it is painted.
  await (drawn ?? new Promise<void>((resolve) => requestAnimationFrame(() => setTimeout(resolve, 0))))
  return performance.now() - started
}

async function browserPart(context: Context): Promise<void> {
  const { app, options, member, jobId } = context
  if (!member || !jobId) return
  section('Job page in headless Chromium')
  let browser: Browser | undefined
  try {
    browser = await within(60_000, 'starting Chromium', chromium.launch({ executablePath: CHROMIUM_PATH, headless: true, args: CHROMIUM_ARGS }))
    figure('browser', `Chromium ${browser.version()}`)
    const browserContext = await browser.newContext({ baseURL: app.baseUrl, viewport: { width: 1280, height: 800 } })
    const [name, ...value] = member.cookie.split('=')
    await browserContext.addCookies([{ name: name!, value: value.join('='), url: app.baseUrl }])
    const page: Page = await browserContext.newPage()
    let crashed = false
    page.on('crash', () => (crashed = true))
    const cdp = await browserContext.newCDPSession(page)

    const started = Date.now()
    const loaded = await step('HTML parsed (DOMContentLoaded)', async () => {
      await page.goto(`/jobs/${jobId}`, { waitUntil: 'domcontentloaded', timeout: options.previewMs })
      figure('HTML parsed (DOMContentLoaded)', seconds(Date.now() - started))
      return true
    })
    if (!loaded) return
    const mode = await step('preview ready', async () => {
      const remaining = Math.max(1000, options.previewMs - (Date.now() - started))
      const handle = await within(remaining + 5000, 'preview ready', page.waitForFunction(previewReady, undefined, { polling: 'raf', timeout: remaining }))
      const found = (await handle.jsonValue()) as string
      if (found !== 'canvas' && found !== 'svg') throw new Error(found)
      figure('preview ready', `${seconds(Date.now() - started)} after navigation (${found === 'canvas' ? 'canvas, data-preview-state="ready"' : 'SVG preview with its paths'})`)
      const roundTrip = Date.now()
      await within(options.previewMs, 'page responds', page.evaluate(() => 1))
      figure('ready and responding', `${seconds(Date.now() - started)} after navigation (evaluate round trip ${seconds(Date.now() - roundTrip)})`)
      return found
    })
    if (crashed) figure('page', 'CRASHED (renderer gone)')
    if (!mode || crashed) return

    const memory = async (label: string) =>
      step(label, async () => {
        const heap = (await within(options.stepMs, 'heap usage', cdp.send('Runtime.getHeapUsage'))) as { usedSize: number; totalSize: number }
        const dom = (await within(options.stepMs, 'DOM counters', cdp.send('Memory.getDOMCounters'))) as { documents: number; nodes: number; jsEventListeners: number }
        const elements = await within(options.stepMs, 'element count', page.evaluate(() => document.getElementsByTagName('*').length))
        figure(label, `JS heap used ${megabytes(heap.usedSize)} of ${megabytes(heap.totalSize)}, DOM nodes ${dom.nodes} (elements ${elements}), listeners ${dom.jsEventListeners}`)
      })
    await memory('memory after the preview is ready')

    const zooms: number[] = []
    await step('zoom step', async () => {
      const budget = Date.now() + options.stepMs
      while (zooms.length < 3 && (zooms.length === 0 || Date.now() < budget)) {
        const roundTrip = Date.now()
        const inPage = await within(options.stepMs, 'zoom step', page.evaluate(zoomStep, options.stepMs))
        zooms.push(inPage)
        if (zooms.length === 1) figure('first zoom step', `${seconds(inPage)} in the page (round trip ${seconds(Date.now() - roundTrip)})`)
      }
      figure('zoom step', `${seconds(median(zooms))} median of ${zooms.length} (worst ${seconds(Math.max(...zooms))})`)
    })
    await memory('memory after zooming')
  } catch (error) {
    figure('browser', `FAILED: ${(error as Error).message.slice(0, 300)}`)
  } finally {
    await within(30_000, 'closing Chromium', browser?.close() ?? Promise.resolve()).catch(() => undefined)
  }
}

async function loadPart(context: Context): Promise<void> {
  const { app, options } = context
  section(`Load: ${options.members} members upload at once while a fifth reads the calendar`)
  const members: Actor[] = []
  const jobIds: number[] = []
  for (let i = 0; i < options.members; i++) {
    const member = await step(`member ${i + 1} sign-up`, () => newMember(app, `load${i + 1}`, options.stepMs))
    const job = member && (await step(`member ${i + 1} job`, () => member.json<{ id: number }>('POST', '/api/jobs', { title: `Fold sheet ${i + 1}`, cutterId: context.cutterId, materialId: context.materialId })))
    if (!member || !job) return
    members.push(member)
    jobIds.push(job.id)
  }
  const reader = context.member ?? (await step('calendar reader sign-in', () => signIn(app, 'member@example.test', PASSWORD, options.stepMs)))
  if (!reader) return
  // The calendar page's week view asks for the bookings and the cutter's availability of the week together.
  const monday = new Date()
  monday.setUTCHours(0, 0, 0, 0)
  monday.setUTCDate(monday.getUTCDate() - ((monday.getUTCDay() + 6) % 7))
  const range = `from=${encodeURIComponent(monday.toISOString())}&to=${encodeURIComponent(new Date(monday.getTime() + 7 * 86_400_000).toISOString())}`
  const calendarPaths = [`/api/bookings?cutter=${context.cutterId}&${range}`, `/api/catalog/cutters/${context.cutterId}/availability?${range}`]
  const READ_TIMEOUT_MS = 30_000

  const rssBefore = rssKb(app.pid)
  let rssPeak = rssBefore
  const sampler = setInterval(() => (rssPeak = Math.max(rssPeak, rssKb(app.pid))), 250)
  const latencies: number[] = []
  const errors = new Map<string, number>()
  let reading = true
  const readLoop = (async () => {
    while (reading) {
      const started = performance.now()
      try {
        const answers = await Promise.all(calendarPaths.map((path) => send(app.baseUrl, 'GET', path, { cookie: reader.cookie, timeoutMs: READ_TIMEOUT_MS })))
        const failed = answers.find((a) => a.status >= 400)
        if (failed) errors.set(`HTTP ${failed.status}`, (errors.get(`HTTP ${failed.status}`) ?? 0) + 1)
      } catch (error) {
        const kind = error instanceof StepTimeout ? `time-out (${READ_TIMEOUT_MS / 1000} s)` : ((error as NodeJS.ErrnoException).code ?? (error as Error).message)
        errors.set(kind, (errors.get(kind) ?? 0) + 1)
      }
      latencies.push(performance.now() - started)
    }
  })()

  const started = performance.now()
  const uploads = await Promise.all(
    members.map(async (member, i) => {
      try {
        const answer = await member.upload(`/api/jobs/${jobIds[i]}/files`, context.svg, context.filename, options.uploadMs)
        const answered = performance.now() - started
        if (answer.status >= 400) return `HTTP ${answer.status}`
        const revision = await waitForAnalysis(app.databaseLocation, jobIds[i]!, Date.now() + options.uploadMs)
        return revision.storedWithAnswer ? answered : performance.now() - started
      } catch (error) {
        return error instanceof StepTimeout ? `> ${error.limitMs / 1000} s` : `failed: ${(error as Error).message.slice(0, 100)}`
      }
    }),
  )
  reading = false
  await readLoop
  figure('uploads + analyses (from the common start)', uploads.map((u) => (typeof u === 'number' ? seconds(u) : u)).join(', '))
  const p95 = [...latencies].sort((a, b) => a - b)[Math.max(0, Math.ceil(0.95 * latencies.length) - 1)] ?? NaN
  figure('calendar reads during the uploads', `${latencies.length}: median ${seconds(median(latencies))}, p95 ${seconds(p95)}, worst ${seconds(Math.max(...latencies))}`)
  figure('calendar read errors', errors.size ? [...errors].map(([kind, count]) => `${kind} × ${count}`).join(', ') : 'none')
  figure('server RSS before / peak during', `${rssText(rssBefore)} / ${rssText(rssPeak)}`)
  await sleep(options.settleMs)
  clearInterval(sampler)
  figure(`server RSS ${options.settleMs / 1000} s after`, rssText(rssKb(app.pid)))
  const staff = await step('staff sign-in', () => signIn(app, 'staff@example.test', PASSWORD, options.stepMs))
  if (staff) await timedGets(context, staff, `GET /api/jobs?scope=all (staff, ${jobIds.length + (context.jobId ? 1 : 0)} large jobs)`, '/api/jobs?scope=all', 3)
}

// ——— the run ———

function ensureBuild(rebuild: boolean): void {
  if (existsSync('.output/server/index.mjs') && !rebuild) {
    console.log(`Reusing .output built ${statSync('.output/server/index.mjs').mtime.toISOString()} (pass --rebuild to build again).`)
    return
  }
  console.log('Building with `nuxt build`…')
  const build = spawnSync('npx', ['nuxt', 'build'], { stdio: 'inherit', env: { ...process.env, NODE_ENV: 'production' }, timeout: 20 * 60_000 })
  if (build.status !== 0) throw new Error(`nuxt build failed (${build.error?.message ?? `exit ${build.status}`})`)
}

async function main(): Promise<void> {
  const options = readOptions(process.argv.slice(2))
  const sheet = foldSheet({ unitsAcross: options.across, unitsDown: options.down, pitchMm: options.pitchMm, jitterSeed: options.seed })
  if (options.saveSvg) writeFileSync(options.saveSvg, sheet.svg)
  const git = (...args: string[]) => spawnSync('git', args, { encoding: 'utf8' }).stdout.trim()
  // The app measured is the code outside the bench's own files.
  const appCommit = git('log', '-1', '--format=%h %<(70,trunc)%s', '--', '.', ':(exclude)scripts/bench-fold.ts', ':(exclude)scripts/lib/fold-sheet.ts', ':(exclude)package.json')
  const commit = `${appCommit} (HEAD ${git('rev-parse', '--short', 'HEAD')}${git('status', '--porcelain', '--untracked-files=no') ? ', with uncommitted changes' : ''})`
  console.log(`Kerfbook fold benchmark — ${new Date().toISOString()}`)
  console.log(`Commit: ${commit}`)
  console.log(`Machine: ${cpus().length} CPUs (${cpus()[0]?.model.trim()}), ${(totalmem() / 1024 ** 3).toFixed(1)} GB memory, Node ${process.version}, load average ${loadText()}`)
  console.log(
    `Pattern: ${options.across} × ${options.down} units of ${options.pitchMm} mm${options.seed === undefined ? '' : `, non-repeating (seed ${options.seed})`}: ${megabytes(sheet.svg.length)}, ${sheet.contours} contours (${sheet.slits} slits, ${sheet.reliefs} reliefs), ${sheet.hinges} narrow hinges by design, ${sheet.widthMm} × ${sheet.heightMm} mm`,
  )
  console.log(`Parts: ${[...options.parts].join(', ')}`)

  ensureBuild(options.rebuild)
  // A private copy, so a rebuild of .output during the run cannot pull chunks from under the server.
  const copyDir = mkdtempSync(join(tmpdir(), 'kerfbook-bench-fold-output-'))
  cpSync('.output', copyDir, { recursive: true })
  let app: BuiltApp | undefined
  const stop = async () => {
    await within(15_000, 'stopping the app', app?.stop() ?? Promise.resolve()).catch(() => undefined)
    rmSync(copyDir, { recursive: true, force: true })
  }
  const deadline = setTimeout(async () => {
    console.error(`\nThe run reached its limit of ${options.maxMs / 60_000} min; stopping with the figures so far.`)
    printTable()
    await stop()
    process.exit(2)
  }, options.maxMs)
  try {
    app = await startBuiltApp({ name: 'kerfbook-bench-fold', outputDir: copyDir, env: { SIGN_IN_LIMIT_PER_MINUTE: '1000' } })
    const reader = await signIn(app, 'member@example.test', PASSWORD, options.stepMs)
    const overview = await reader.json<{ name: string; kind: string; cutterId: number; materials: { materialId: number; name: string; thicknessMm: number }[] }[]>('GET', '/api/catalog/overview')
    const laser = overview.find((c) => c.kind === 'co2-laser')
    const plywood = laser?.materials.find((m) => m.name === 'Birch plywood' && m.thicknessMm === 3)
    if (!laser || !plywood) throw new Error('the demo laser or its 3 mm birch plywood is missing from the catalog')
    console.log(`Process: ${laser.name}, ${plywood.name} ${plywood.thicknessMm} mm`)
    figures.push(['commit', commit], ['load average at the start (1 / 5 / 15 min)', `${loadText()} on ${cpus().length} CPUs`], ['pattern', `${options.across} × ${options.down} units, ${megabytes(sheet.svg.length)}, ${sheet.contours} contours${options.seed === undefined ? '' : ', non-repeating'}`])
    const context: Context = { app, options, svg: sheet.svg, filename: `fold-sheet-${options.across}x${options.down}.svg`, cutterId: laser.cutterId, materialId: plywood.materialId }
    if (options.parts.has('upload')) await uploadPart(context)
    if (options.parts.has('api')) await apiPart(context)
    if (options.parts.has('page')) await pagePart(context)
    if (options.parts.has('browser')) await browserPart(context)
    if (options.parts.has('load')) await loadPart(context)
    printTable()
  } finally {
    clearTimeout(deadline)
    await stop()
  }
}

main().then(
  () => process.exit(0),
  (error) => {
    console.error(error)
    printTable()
    process.exit(1)
  },
)
