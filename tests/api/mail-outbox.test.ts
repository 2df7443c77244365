// Mail goes through the outbox: with a mail server that accepts and never answers, or refuses, requests still
// answer at once, staff see what is undelivered, and every mail arrives once the mail server is back.
// This file starts a server of its own (the built app), pointed at a mail server the test controls.
import { createHash } from 'node:crypto'
import { createServer, type Server, type Socket } from 'node:net'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { startBuiltApp, type BuiltApp } from '../../scripts/lib/built-app'
import { freePort } from '../../scripts/lib/free-port'
import { startSmtpSink, type SmtpSink } from '../../scripts/lib/smtp-sink'
import { DEMO_PASSWORD, sqlRow, sqlRows } from './helpers'

// The sender's deadline for each SMTP stage: the silent mail server makes every first attempt fail only after it.
const SMTP_DEADLINE_MS = 5000

let app: BuiltApp
let smtpPort: number
let silent: { server: Server; sockets: Set<Socket> } | null = null
let sink: SmtpSink | null = null

/** A mail server that takes the connection and then says nothing, ever. */
async function startSilentServer(port: number) {
  const sockets = new Set<Socket>()
  const server = createServer((socket) => {
    sockets.add(socket)
    socket.on('close', () => sockets.delete(socket))
  })
  await new Promise<void>((resolve) => server.listen(port, '127.0.0.1', resolve))
  return { server, sockets }
}

async function stopSilentServer() {
  if (!silent) return
  for (const socket of silent.sockets) socket.destroy()
  await new Promise((resolve) => silent!.server.close(resolve))
  silent = null
}

async function call(path: string, body?: unknown, cookie = '') {
  const response = await fetch(app.baseUrl + path, {
    method: body === undefined ? 'GET' : 'POST',
    headers: { 'content-type': 'application/json', 'x-forwarded-for': `10.9.0.${Math.floor(Math.random() * 250)}`, ...(cookie ? { cookie } : {}) },
    body: body === undefined ? undefined : JSON.stringify(body),
  })
  const text = await response.text()
  return { status: response.status, body: text ? JSON.parse(text) : null, cookie: response.headers.getSetCookie()[0]?.split(';')[0] ?? '' }
}

/**
 * True while no mail to `recipient` has had an attempt fail. With the mail server silent, a first attempt fails only
 * when the sender's deadline passes; a request that waited for the mail server would answer only after that, so an
 * answer that finds its mail still untried did not wait (an order of events, not a stopwatch).
 */
async function untried(recipient: string): Promise<boolean> {
  const row = await sqlRow<{ n: number }>('select count(*) as n from mail_outbox where recipient = ? and attempts > 0', [recipient], app.databaseLocation)
  return row!.n === 0
}

async function until<T>(what: string, probe: () => T | undefined | Promise<T | undefined>, timeoutMs = 20_000): Promise<T> {
  const deadline = Date.now() + timeoutMs
  while (Date.now() < deadline) {
    const found = await probe()
    if (found) return found
    await new Promise((r) => setTimeout(r, 100))
  }
  throw new Error(`${what} did not happen within ${timeoutMs} ms`)
}

beforeAll(async () => {
  smtpPort = await freePort()
  silent = await startSilentServer(smtpPort)
  app = await startBuiltApp({
    name: 'kerfbook-mail-outbox',
    postgresUrl: inject('postgresUrl'),
    env: { SMTP_URL: `smtp://127.0.0.1:${smtpPort}`, TRUST_PROXY: '1', MAIL_TIMEOUT_MS: String(SMTP_DEADLINE_MS), MAIL_RETRY_BASE_MS: '200', MAIL_RETRY_MAX_MS: '500', MAIL_MAX_ATTEMPTS: '1000', MAIL_OUTBOX_INTERVAL_MS: '100' },
  })
})

afterAll(async () => {
  await stopSilentServer()
  await sink?.close()
  await app?.stop()
})

describe('the mail outbox', () => {
  it('answers at once while the mail server is silent or refusing, shows staff what is undelivered, and delivers every mail once it is back', async () => {
    const email = `outbox-${Date.now()}@example.test`
    // Requests that mail answer without waiting for the mail server (before the outbox: 60 s, or never).
    const signUp = await call('/api/auth/sign-up', { name: 'Perpetua Quill', email, password: 'long-enough-pass' })
    expect(signUp.status).toBe(201)
    expect(await untried(email)).toBe(true)
    const nobody = `nobody-${Date.now()}@example.test`
    const known = await call('/api/auth/forgot-password', { email: 'member@example.test' })
    const unknown = await call('/api/auth/forgot-password', { email: nobody })
    expect([known.status, unknown.status]).toEqual([200, 200])
    expect(known.body.message.replace('member@example.test', '')).toBe(unknown.body.message.replace(nobody, ''))
    expect([await untried('member@example.test'), await untried(nobody)]).toEqual([true, true])
    // The same work for both: one outbox row each, written by the request; the sender decides what becomes of it.
    const rows = await sqlRows("select recipient, subject from mail_outbox where recipient in ('member@example.test', ?) and subject = 'Reset your password'", [nobody], app.databaseLocation)
    expect(rows).toHaveLength(2)

    // Staff see the mails the silent server holds up, with the reason.
    const staff = await call('/api/auth/sign-in', { email: 'staff@example.test', password: DEMO_PASSWORD })
    expect(staff.status).toBe(200)
    const stuck = await until('a failed attempt', async () => {
      const list = (await call('/api/staff/mail-outbox', undefined, staff.cookie)).body as { recipient: string; subject: string; attempts: number; lastError: string }[]
      return list.find((m) => m.recipient === email && m.attempts > 0)
    })
    expect(stuck.subject).toBe('Confirm your e-mail')
    expect(stuck.lastError).toMatch(/greeting never received|timeout|timed out/i)
    const member = await call('/api/auth/sign-in', { email: 'member@example.test', password: DEMO_PASSWORD })
    expect((await call('/api/staff/mail-outbox', undefined, member.cookie)).status).toBe(403)

    // Now the mail server refuses connections outright; the member asks for a new confirmation link meanwhile.
    await stopSilentServer()
    const again = await call('/api/auth/verification-mail', { email })
    // A refusing server fails an attempt at once, so there is no wait to rule out here: the answer is the point.
    expect(again.status).toBe(200)
    await until('a refused attempt', async () => {
      const list = (await call('/api/staff/mail-outbox', undefined, staff.cookie)).body as { recipient: string; lastError: string }[]
      return list.find((m) => m.recipient === email && /ECONNREFUSED/.test(m.lastError))
    })

    // The mail server is back: everything queued arrives, each once, and the outbox is empty.
    sink = await startSmtpSink({ smtpPort })
    const confirmations = await until('both confirmation mails', () => {
      const mails = sink!.messages.filter((m) => m.to.includes(email) && /Confirm your e-mail/.test(m.subject))
      return mails.length >= 2 ? mails : undefined
    })
    await until('the reset mail', () => sink!.messages.find((m) => m.to.includes('member@example.test') && /Reset your password/.test(m.subject)))
    await until('an empty outbox', async () => ((await call('/api/staff/mail-outbox', undefined, staff.cookie)).body.length === 0 ? true : undefined))
    await new Promise((r) => setTimeout(r, 500))
    expect(sink.messages.filter((m) => m.to.includes(email))).toHaveLength(2)

    // The new link replaced the first (the older mail may arrive second: it waited out a back-off); only the new one confirms.
    const tokens = confirmations.map((m) => m.text.match(/\/verify\?token=([A-Za-z0-9_-]+)/)![1]!)
    const replaced = async (token: string) =>
      (await sqlRow<{ used_at: string | null }>('select used_at from auth_tokens where token_hash = ?', [createHash('sha256').update(token).digest('hex')], app.databaseLocation))!.used_at !== null
    const [older, newer] = (await replaced(tokens[0]!)) ? [tokens[0]!, tokens[1]!] : [tokens[1]!, tokens[0]!]
    expect((await call('/api/auth/verify', { token: older })).status).toBe(400)
    expect((await call('/api/auth/verify', { token: newer })).status).toBe(200)
  })
})
