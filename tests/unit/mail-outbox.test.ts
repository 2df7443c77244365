// The outbox's sender against a real SQLite database (all migrations), with a mail server stood in by a function.
import knex, { type Knex } from 'knex'
import { afterEach, beforeEach, describe, expect, it } from 'vitest'
import { migrationSource } from '../../db/migrations/index'
import { composeAccountMail, requestAccountMail } from '../../server/services/account-mail'
import { deliverDueMail, queueMail, retryDelayMs, retryMailNow, undeliveredMail, type MailMessage, type OutboxPolicy } from '../../server/services/mail-outbox'
import { consumeToken } from '../../server/services/tokens'

const POLICY: OutboxPolicy = { maxAttempts: 3, baseDelayMs: 1000, maxDelayMs: 3000, staleClaimMs: 60_000, batch: 10 }
const message: MailMessage = { to: 'juno@example.test', subject: 'Cut: Shelf brackets', paragraphs: ['"Shelf brackets" has been cut.'] }

let db: Knex
let clock: number
const now = () => new Date(clock)

beforeEach(async () => {
  db = knex({ client: 'better-sqlite3', connection: { filename: ':memory:' }, useNullAsDefault: true, pool: { min: 1, max: 1 }, migrations: { migrationSource } })
  await db.migrate.latest()
  clock = Date.now() + 1000
})
afterEach(() => db.destroy())

describe('mail outbox', () => {
  it('is written with the change it reports: a rolled-back transaction leaves no mail', async () => {
    await db.transaction(async (trx) => {
      await queueMail(trx, message)
      throw new Error('the change failed')
    }).catch(() => undefined)
    expect(await db('mail_outbox').count({ n: '*' }).first()).toEqual({ n: 0 })
  })

  it('sends a due mail once, however often the sender runs', async () => {
    await queueMail(db, message)
    const sent: MailMessage[] = []
    const send = async (m: MailMessage) => void sent.push(m)
    expect(await deliverDueMail(db, send, POLICY, now)).toEqual({ sent: 1, failed: 0, dead: 0 })
    await deliverDueMail(db, send, POLICY, now)
    expect(sent).toEqual([message])
  })

  it('retries a failed mail with doubling waits, then dead-letters it where staff see it', async () => {
    const id = await queueMail(db, message)
    const refuse = async () => {
      throw new Error('connect ECONNREFUSED 127.0.0.1:25')
    }
    expect(await deliverDueMail(db, refuse, POLICY, now)).toMatchObject({ failed: 1 })
    // Not due again until the back-off has passed.
    expect(await deliverDueMail(db, refuse, POLICY, now)).toMatchObject({ failed: 0 })
    clock += retryDelayMs(1, POLICY)
    expect(await deliverDueMail(db, refuse, POLICY, now)).toMatchObject({ failed: 1 })
    clock += retryDelayMs(2, POLICY)
    expect(await deliverDueMail(db, refuse, POLICY, now)).toMatchObject({ dead: 1 })
    expect(await undeliveredMail(db)).toMatchObject([{ id, status: 'dead', attempts: 3, lastError: expect.stringContaining('ECONNREFUSED') }])
    // Staff send it again once the mail server is back.
    expect(await retryMailNow(db, id)).toBe('queued')
    expect(await deliverDueMail(db, async () => undefined, POLICY, now)).toMatchObject({ sent: 1 })
    expect(await undeliveredMail(db)).toEqual([])
    expect(await retryMailNow(db, id)).toBe('delivered')
  })

  it('doubles the wait after each failure up to the cap', () => {
    expect([1, 2, 3, 4].map((n) => retryDelayMs(n, POLICY))).toEqual([1000, 2000, 3000, 3000])
  })

  it('takes back a mail whose sender stopped mid-send', async () => {
    const id = await queueMail(db, message)
    await db('mail_outbox').where({ id }).update({ status: 'sending', claimed_at: new Date(clock - 2 * POLICY.staleClaimMs).toISOString() })
    expect(await deliverDueMail(db, async () => undefined, POLICY, now)).toMatchObject({ sent: 1 })
  })
})

describe('a link asked for by address (forgot password, a new confirmation link)', () => {
  /** The statements a request for `email` runs, with the address itself and the clock taken out. */
  async function workOf(kind: 'password-reset' | 'verification', email: string) {
    const statements: string[] = []
    const log = (query: { sql: string; bindings?: unknown[] }) => statements.push(`${query.sql} [${query.bindings?.length ?? 0} values]`)
    db.on('query', log)
    await requestAccountMail(db, kind, email)
    db.off('query', log)
    return statements
  }

  async function account(email: string, verified: boolean): Promise<number> {
    const [id] = await db('users').insert({ name: 'Juno Castellane', email, password_hash: 'not-used-here', role: 'member', email_verified_at: verified ? new Date().toISOString() : null })
    return id!
  }

  it('does the same work for an address with an account and one without; the sender mails the account only', async () => {
    const userId = await account('juno@example.test', true)
    const known = await workOf('password-reset', 'juno@example.test')
    const unknown = await workOf('password-reset', 'nobody@example.test')
    expect(known.length).toBeGreaterThan(0)
    expect(unknown).toEqual(known)

    const sent: MailMessage[] = []
    expect(await deliverDueMail(db, async (m) => void sent.push(m), POLICY, now, composeAccountMail)).toEqual({ sent: 1, failed: 0, dead: 0 })
    expect(sent.map((m) => [m.to, m.subject])).toEqual([['juno@example.test', 'Reset your password']])
    const token = sent[0]!.action!.url.match(/\/reset-password\?token=([A-Za-z0-9_-]+)$/)![1]!
    expect(await consumeToken(db, 'reset-password', token)).toBe(userId)
    // The request for the address without an account is dropped by the sender: never sent, never shown as undelivered.
    expect(await db('mail_outbox').where({ recipient: 'nobody@example.test' }).first('status')).toEqual({ status: 'dropped' })
    expect(await undeliveredMail(db)).toEqual([])
  })

  it('mails a new confirmation link only to an account still to confirm, the same work either way', async () => {
    await account('confirmed@example.test', true)
    await account('waiting@example.test', false)
    const works: string[][] = []
    for (const email of ['confirmed@example.test', 'waiting@example.test', 'nobody@example.test']) works.push(await workOf('verification', email))
    expect(works[1]).toEqual(works[0])
    expect(works[2]).toEqual(works[0])
    const sent: MailMessage[] = []
    await deliverDueMail(db, async (m) => void sent.push(m), POLICY, now, composeAccountMail)
    expect(sent.map((m) => [m.to, m.subject])).toEqual([['waiting@example.test', 'Confirm your e-mail']])
  })

  it('sends the same link again when the first attempt fails, instead of a new one', async () => {
    await account('juno@example.test', true)
    await requestAccountMail(db, 'password-reset', 'juno@example.test')
    const attempts: MailMessage[] = []
    const refuseOnce = async (m: MailMessage) => {
      attempts.push(m)
      if (attempts.length === 1) throw new Error('connect ECONNREFUSED 127.0.0.1:25')
    }
    expect(await deliverDueMail(db, refuseOnce, POLICY, now, composeAccountMail)).toMatchObject({ failed: 1 })
    // Staff see it under its real subject and recipient while it waits.
    expect(await undeliveredMail(db)).toMatchObject([{ recipient: 'juno@example.test', subject: 'Reset your password', attempts: 1 }])
    clock += retryDelayMs(1, POLICY)
    expect(await deliverDueMail(db, refuseOnce, POLICY, now, composeAccountMail)).toMatchObject({ sent: 1 })
    expect(attempts[1]).toEqual(attempts[0])
  })
})
