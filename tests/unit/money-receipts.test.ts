// A payment receipt is written in the transaction of the ledger entry it reports: a replayed event writes neither,
// and a receipt that can't be written takes its entry back with it (so a retry of the event writes both).
import knex, { type Knex } from 'knex'
import type Stripe from 'stripe'
import { afterEach, beforeEach, describe, expect, it } from 'vitest'
import { migrationSource } from '../../db/migrations/index'
import { syncPaymentIntent } from '../../server/services/payments'

let db: Knex

beforeEach(async () => {
  db = knex({ client: 'better-sqlite3', connection: { filename: ':memory:' }, useNullAsDefault: true, pool: { min: 1, max: 1 }, migrations: { migrationSource } })
  await db.migrate.latest()
  const [memberId] = await db('users').insert({ name: 'Juno Castellane', email: 'juno@example.test', password_hash: 'not-used-here', role: 'member' })
  // The booking's money needs no cutter or job rows here.
  await db.raw('pragma foreign_keys = off')
  await db('bookings').insert({ id: 7, cutter_id: 1, member_id: memberId, starts_at: '2026-12-05T09:00:00.000Z', ends_at: '2026-12-05T09:15:00.000Z', status: 'held', hold_expires_at: '2999-01-01T00:00:00.000Z', ical_uid: 'booking-7@kerfbook.test' })
})
afterEach(() => db.destroy())

// A PaymentIntent as Stripe reports it once the card is authorised for a manual capture.
const held = { id: 'pi_receipt', object: 'payment_intent', status: 'requires_capture', amount: 1260, amount_received: 0, currency: 'eur', metadata: { bookingId: '7' } } as unknown as Stripe.PaymentIntent

const ledger = () => db('payment_ledger').select('kind', 'amount_minor')
const mails = () => db('mail_outbox').select('recipient', 'subject')

describe('payment receipts', () => {
  it('are written once with their ledger entry, and not again for a replay', async () => {
    expect((await syncPaymentIntent(db, held))?.newKinds).toEqual(['authorised'])
    expect(await ledger()).toEqual([{ kind: 'authorised', amount_minor: 1260 }])
    expect(await mails()).toEqual([{ recipient: 'juno@example.test', subject: 'Payment received — your slot is confirmed' }])
    const message = JSON.parse((await db('mail_outbox').first('message_json')).message_json)
    expect(message.paragraphs).toContain('We hold €12.60 on your card. You are charged only for the minutes actually cut; the rest of the hold is released.')
    for (let i = 0; i < 3; i++) expect((await syncPaymentIntent(db, held))?.newKinds).toEqual([])
    expect(await ledger()).toHaveLength(1)
    expect(await mails()).toHaveLength(1)
  })

  it('take their ledger entry back when the receipt can not be written, so the next report writes both', async () => {
    await db.raw("create trigger refuse_mail before insert on mail_outbox begin select raise(abort, 'the outbox refused the mail'); end")
    await expect(syncPaymentIntent(db, held)).rejects.toThrow(/refused the mail/)
    expect(await ledger()).toEqual([])
    await db.raw('drop trigger refuse_mail')
    expect((await syncPaymentIntent(db, held))?.newKinds).toEqual(['authorised'])
    expect(await ledger()).toHaveLength(1)
    expect(await mails()).toHaveLength(1)
  })
})
