// Shared helpers for API tests: a cookie-keeping client per actor, and the mail sink.
/* eslint-disable @typescript-eslint/no-explicit-any -- a test reads whatever JSON a route answers */
import type { Knex } from 'knex'
import { afterAll, inject } from 'vitest'
import { isPostgres } from '../../db/dialect'
import { openDatabase } from '../../db/index'

export const DEMO_PASSWORD = 'kerfbook-demo'

const openDatabases = new Map<string, Knex>()
afterAll(async () => {
  for (const db of openDatabases.values()) await db.destroy()
  openDatabases.clear()
})

/** The app's database as the test run set it up (SQLite file or PostgreSQL), opened once per test file. */
export function appDb(location = inject('databaseLocation')): Knex {
  let db = openDatabases.get(location)
  if (!db) openDatabases.set(location, (db = openDatabase(location)))
  return db
}

/** A cut file as a browser upload sends it (multipart, field "file"), with any other fields of the form. */
export function svgForm(svg: string | Blob, fields: Record<string, string | number> = {}, filename = 'part.svg'): FormData {
  const form = new FormData()
  form.set('file', typeof svg === 'string' ? new Blob([svg], { type: 'image/svg+xml' }) : svg, filename)
  for (const [key, value] of Object.entries(fields)) form.set(key, String(value))
  return form
}

/** Rows of one SQL statement (`?` placeholders) on the app's database, whichever it is. */
export async function sqlRows<T = any>(sql: string, params: readonly unknown[] = [], location = inject('databaseLocation')): Promise<T[]> {
  const db = appDb(location)
  const result = await db.raw(sql, params as Knex.RawBinding[])
  return (isPostgres(db) ? result.rows : result) as T[]
}

/** The first row of one SQL statement, or undefined. */
export async function sqlRow<T = any>(sql: string, params: readonly unknown[] = [], location = inject('databaseLocation')): Promise<T | undefined> {
  return (await sqlRows<T>(sql, params, location))[0]
}

export interface ApiResponse<T = unknown> {
  status: number
  headers: Headers
  body: T
}

let addressCounter = 0

/** A client that keeps its own session cookie and appears to come from its own IP address. */
export function client(ip = `10.0.${Math.floor(Math.random() * 250)}.${++addressCounter % 250}`, baseUrl = inject('baseUrl')) {
  let cookie = ''
  async function request<T = any>(method: string, path: string, body?: unknown, raw?: string | FormData): Promise<ApiResponse<T>> {
    const headers: Record<string, string> = { 'x-forwarded-for': ip, accept: 'application/json' }
    if (cookie) headers.cookie = cookie
    if (body !== undefined || typeof raw === 'string') headers['content-type'] = 'application/json'
    const response = await fetch(baseUrl + path, { method, headers, body: raw ?? (body === undefined ? undefined : JSON.stringify(body)) })
    const setCookie = response.headers.getSetCookie()
    for (const c of setCookie) {
      const pair = c.split(';')[0]!
      cookie = pair.endsWith('=') ? '' : pair
    }
    const text = await response.text()
    let parsed: unknown = text
    try {
      parsed = JSON.parse(text)
    } catch {
      // not JSON
    }
    return { status: response.status, headers: response.headers, body: parsed as T }
  }
  return {
    get: <T = any>(path: string) => request<T>('GET', path),
    post: <T = any>(path: string, body?: unknown) => request<T>('POST', path, body ?? {}),
    patch: <T = any>(path: string, body?: unknown) => request<T>('PATCH', path, body ?? {}),
    put: <T = any>(path: string, body?: unknown) => request<T>('PUT', path, body ?? {}),
    delete: <T = any>(path: string) => request<T>('DELETE', path),
    raw: <T = any>(method: string, path: string, text: string) => request<T>(method, path, undefined, text),
    /** multipart/form-data, as a browser upload sends it. */
    form: <T = any>(path: string, form: FormData) => request<T>('POST', path, undefined, form),
    hasCookie: () => cookie !== '',
    /** The session cookie (name=value), to carry the session to another app server. */
    cookie: () => cookie,
    useCookie: (value: string) => {
      cookie = value
    },
    /** A binary answer; fetch undoes a Content-Encoding as a browser does. */
    bytes: async (path: string, headers: Record<string, string> = {}) => {
      const response = await fetch(baseUrl + path, { headers: { 'x-forwarded-for': ip, ...(cookie ? { cookie } : {}), ...headers } })
      return { status: response.status, headers: response.headers, body: new Uint8Array(await response.arrayBuffer()) }
    },
  }
}

export async function signedIn(email: string, password = DEMO_PASSWORD, baseUrl = inject('baseUrl')) {
  const c = client(undefined, baseUrl)
  const response = await c.post('/api/auth/sign-in', { email, password })
  if (response.status !== 200) throw new Error(`sign-in as ${email} failed: ${response.status} ${JSON.stringify(response.body)}`)
  return c
}

export interface SinkMessage {
  to: string[]
  subject: string
  text: string
  html: string
  attachments: { filename: string; contentType: string; content: string }[]
}

/** Waits until the app's mail outbox has sent everything queued so far (mail leaves the app in the background). */
export async function outboxDrained(timeoutMs = 10_000): Promise<void> {
  const deadline = Date.now() + timeoutMs
  while (Date.now() < deadline) {
    const { n } = (await sqlRow<{ n: number }>("select count(*) as n from mail_outbox where status in ('pending', 'sending')"))!
    if (n === 0) return
    await new Promise((r) => setTimeout(r, 50))
  }
  throw new Error(`The mail outbox still had mail to send after ${timeoutMs} ms`)
}

/** Waits for the newest message to `to` whose subject matches, as the SMTP sink received it, once the outbox has sent what was queued. */
export async function waitForMail(to: string, subject: RegExp, timeoutMs = 5000): Promise<SinkMessage> {
  await outboxDrained()
  const deadline = Date.now() + timeoutMs
  while (Date.now() < deadline) {
    const messages = (await (await fetch(`${inject('outboxUrl')}/messages`)).json()) as SinkMessage[]
    const found = messages.find((m) => m.to.includes(to) && subject.test(m.subject))
    if (found) return found
    await new Promise((r) => setTimeout(r, 100))
  }
  throw new Error(`No mail to ${to} matching ${subject} arrived within ${timeoutMs} ms`)
}

export function linkToken(mail: SinkMessage, path: string): string {
  const match = mail.text.match(new RegExp(`${path}\\?token=([A-Za-z0-9_-]+)`))
  if (!match) throw new Error(`No ${path} link in mail: ${mail.text}`)
  return match[1]!
}

export function uniqueEmail(prefix: string): string {
  return `${prefix}-${Date.now()}-${Math.floor(Math.random() * 1e6)}@example.test`
}

/**
 * A new job of `member` on the demo's CO₂ laser in 3 mm birch plywood with one SVG file uploaded and analysed:
 * the set-up most journeys start from.
 */
export async function laserPlywoodJob(
  member: ReturnType<typeof client>,
  title: string,
  svg: string,
  fileName: string,
): Promise<{ jobId: number; fileId: number }> {
  const overview = (await member.get('/api/catalog/overview')).body as { name: string; cutterId: number; materials: { name: string; materialId: number }[] }[]
  const heron = overview.find((c) => c.name.startsWith('Heron'))!
  const created = await member.post('/api/jobs', { title, cutterId: heron.cutterId, materialId: heron.materials.find((m) => m.name === 'Birch plywood')!.materialId })
  if (created.status !== 201) throw new Error(`creating the job answered ${created.status}`)
  const form = new FormData()
  form.set('file', new Blob([svg], { type: 'image/svg+xml' }), fileName)
  const added = await member.form(`/api/jobs/${created.body.id}/files`, form)
  if (added.status !== 201) throw new Error(`uploading ${fileName} answered ${added.status}: ${JSON.stringify(added.body).slice(0, 300)}`)
  return { jobId: created.body.id as number, fileId: added.body.fileId as number }
}
