import type { Knex } from 'knex'
import type { Page } from '#shared/schemas/paging'
import { keysetPage, mapPage } from '../utils/paging'
import { deliverBySmtp, type OutgoingMail } from '../utils/mailer'
import { nowIso } from '../utils/rows'
import { workshopDisplayName } from './settings'
import { insertedId } from '../../db/dialect'

/** A mail as the services write it; the mailer renders it (HTML and text) when it is sent. */
export interface MailMessage extends OutgoingMail {
  /**
   * A mail whose content the sender decides when it takes the row (`ComposeMail`), e.g. a reset link for an address
   * that may have no account: the request writes the same row either way and the sender drops it if there is none.
   */
  deferred?: DeferredMailKind
}

export type DeferredMailKind = 'password-reset' | 'verification'

/** Turns a deferred mail into the mail to send, in the transaction that records it; null: nothing to send. */
export type ComposeMail = (trx: Knex, message: MailMessage & { deferred: DeferredMailKind }) => Promise<MailMessage | null>

export interface OutboxPolicy {
  /** Attempts before a mail is dead-lettered. */
  maxAttempts: number
  /** Wait after the first failure; doubled after each further one, up to `maxDelayMs`. */
  baseDelayMs: number
  maxDelayMs: number
  /** A claim older than this was left by a sender that stopped mid-send; the mail is tried again. */
  staleClaimMs: number
  batch: number
}

/** From MAIL_MAX_ATTEMPTS, MAIL_RETRY_BASE_MS, MAIL_RETRY_MAX_MS (README: Mail). */
export function outboxPolicy(env = process.env): OutboxPolicy {
  return {
    maxAttempts: Number(env.MAIL_MAX_ATTEMPTS || 10),
    baseDelayMs: Number(env.MAIL_RETRY_BASE_MS || 30_000),
    maxDelayMs: Number(env.MAIL_RETRY_MAX_MS || 60 * 60_000),
    staleClaimMs: 10 * 60_000,
    batch: 20,
  }
}

/** Writes the mail into the outbox; pass the transaction of the change it reports, so both commit or neither. */
export async function queueMail(db: Knex, message: MailMessage): Promise<number> {
  const id = await insertedId(db('mail_outbox').insert({ recipient: message.to, subject: message.subject, message_json: JSON.stringify(message), next_attempt_at: nowIso() }))
  return id
}

/**
 * Puts the mail in the outbox; the background sender delivers it. Pass the transaction of the change the mail
 * reports, so the two commit together. Never waits for the mail server.
 */
export async function sendMail(message: MailMessage, db: Knex): Promise<boolean> {
  await queueMail(db, message)
  return true
}

/** The outbox sender's delivery: one mail through SMTP_URL, signed with the workshop's name. */
export async function deliverAsWorkshop(db: Knex, message: MailMessage): Promise<void> {
  await deliverBySmtp(message, await workshopDisplayName(db))
}

/** Exponential back-off: base, 2 × base, 4 × base … never more than the cap. */
export function retryDelayMs(failedAttempts: number, policy: Pick<OutboxPolicy, 'baseDelayMs' | 'maxDelayMs'>): number {
  return Math.min(policy.maxDelayMs, policy.baseDelayMs * 2 ** Math.max(0, failedAttempts - 1))
}

/**
 * Sends the mails that are due, each claimed first (so two senders never send one mail twice), and records
 * the outcome: sent; or tried again later with back-off; or dead after the last attempt.
 */
export async function deliverDueMail(
  db: Knex,
  send: (message: MailMessage) => Promise<void>,
  policy: OutboxPolicy,
  now = () => new Date(),
  compose?: ComposeMail,
): Promise<{ sent: number; failed: number; dead: number }> {
  const stale = new Date(now().getTime() - policy.staleClaimMs).toISOString()
  await db('mail_outbox').where({ status: 'sending' }).where('claimed_at', '<', stale).update({ status: 'pending', claimed_at: null })
  const outcome = { sent: 0, failed: 0, dead: 0 }
  // Batch after batch until nothing is due; a failed mail is due again only after its back-off, so this ends.
  for (;;) {
    const due = await db('mail_outbox').where({ status: 'pending' }).where('next_attempt_at', '<=', now().toISOString()).orderBy('id').limit(policy.batch).select('id', 'message_json', 'attempts')
    await deliverBatch(db, due, send, policy, now, outcome, compose)
    if (due.length < policy.batch) return outcome
  }
}

/**
 * A claimed deferred mail becomes the mail it stands for, written over the row with whatever composing it wrote (a
 * token), so a retry sends the same mail; or, with nothing to send, the row is dropped. Other mails pass as they are.
 */
async function composed(db: Knex, id: number, message: MailMessage, compose: ComposeMail | undefined): Promise<MailMessage | null> {
  const kind = message.deferred
  if (!kind) return message
  return db.transaction(async (trx) => {
    const mail = compose ? await compose(trx, { ...message, deferred: kind }) : null
    if (mail) await trx('mail_outbox').where({ id }).update({ recipient: mail.to, subject: mail.subject, message_json: JSON.stringify(mail), updated_at: nowIso() })
    else await trx('mail_outbox').where({ id }).update({ status: 'dropped', claimed_at: null, updated_at: nowIso() })
    return mail
  })
}

async function deliverBatch(
  db: Knex,
  due: { id: number; message_json: string; attempts: number }[],
  send: (message: MailMessage) => Promise<void>,
  policy: OutboxPolicy,
  now: () => Date,
  outcome: { sent: number; failed: number; dead: number },
  compose?: ComposeMail,
): Promise<void> {
  for (const row of due) {
    const claimed = await db('mail_outbox').where({ id: row.id, status: 'pending' }).update({ status: 'sending', claimed_at: now().toISOString() })
    if (claimed !== 1) continue
    try {
      const message = await composed(db, row.id, JSON.parse(row.message_json) as MailMessage, compose)
      if (!message) continue
      await send(message)
      await db('mail_outbox').where({ id: row.id }).update({ status: 'sent', sent_at: now().toISOString(), attempts: row.attempts + 1, last_error: null, updated_at: nowIso() })
      outcome.sent++
    } catch (error) {
      const attempts = row.attempts + 1
      const dead = attempts >= policy.maxAttempts
      await db('mail_outbox')
        .where({ id: row.id })
        .update({
          status: dead ? 'dead' : 'pending',
          attempts,
          claimed_at: null,
          last_error: String((error as Error).message ?? error).slice(0, 500),
          next_attempt_at: new Date(now().getTime() + retryDelayMs(attempts, policy)).toISOString(),
          updated_at: nowIso(),
        })
      if (dead) outcome.dead++
      else outcome.failed++
    }
  }
}

export interface UndeliveredMail {
  id: number
  recipient: string
  subject: string
  status: 'pending' | 'sending' | 'dead'
  attempts: number
  lastError: string | null
  nextAttemptAt: string
  createdAt: string
}

const undeliveredQuery = (db: Knex) => db('mail_outbox').whereIn('status', ['pending', 'sending', 'dead']).where((q) => q.where('attempts', '>', 0).orWhere('status', 'dead'))
/** The columns of a mail_outbox row the list of undelivered mail reads. */
interface UndeliveredRow {
  id: number
  recipient: string
  subject: string
  status: UndeliveredMail['status']
  attempts: number
  last_error: string | null
  next_attempt_at: string
  created_at: string
}

const toUndelivered = (r: UndeliveredRow): UndeliveredMail => ({
  id: r.id,
  recipient: r.recipient,
  subject: r.subject,
  status: r.status,
  attempts: r.attempts,
  lastError: r.last_error,
  nextAttemptAt: r.next_attempt_at,
  createdAt: r.created_at,
})

/** Mail not delivered yet: waiting for a retry after a failure, being sent, or dead-lettered. Newest first. */
export async function undeliveredMail(db: Knex): Promise<UndeliveredMail[]> {
  return (await undeliveredQuery(db).orderBy('id', 'desc').limit(200)).map(toUndelivered)
}

/** The same, a page at a time. */
export async function undeliveredMailPage(db: Knex, page: { limit: number; cursor?: string }): Promise<Page<UndeliveredMail>> {
  const order = { columns: ['id'], direction: 'desc' as const, keyOf: (r: { id: number }) => [r.id] }
  return mapPage(await keysetPage<UndeliveredRow>(undeliveredQuery(db).select('*'), order, page), (rows) => rows.map(toUndelivered))
}

/** Staff send a dead (or waiting) mail again now; a mail already sent or being sent is left alone. */
export async function retryMailNow(db: Knex, id: number): Promise<'queued' | 'delivered' | 'missing'> {
  const changed = await db('mail_outbox').where({ id }).whereIn('status', ['dead', 'pending']).update({ status: 'pending', attempts: 0, next_attempt_at: nowIso(), updated_at: nowIso() })
  if (changed === 1) return 'queued'
  return (await db('mail_outbox').where({ id }).first('id')) ? 'delivered' : 'missing'
}
