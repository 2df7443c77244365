// The outbox's sender against a real SQLite database (all migrations), with a mail server stood in by a function.
import knex, { type Knex } from 'knex'
import { afterEach, beforeEach, describe, expect, it } from 'vitest'
import { migrationSource } from '../../db/migrations/index'
import { deliverDueMail, queueMail, retryDelayMs, retryMailNow, undeliveredMail, type MailMessage, type OutboxPolicy } from '../../server/services/mail-outbox'

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
