// At a busy workshop's volume: admin payments with fifty thousand bookings, the payment state in SQL against the
// one rule in payments.ts, the run sheet's query count, the lower bound on a cutter's bookings, the generator's repeatability.
import fc from 'fast-check'
import type { Knex } from 'knex'
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import { seedHistory } from '../../../db/seeds/history'
import { listBookings } from '../../../server/services/bookings'
import { listPayments, listPaymentsPage, paymentTotals } from '../../../server/services/payment-list'
import { paymentStateOf, type LedgerKind } from '../../../server/services/payments'
import { runSheet } from '../../../server/services/run-sheet'
import { demoDatabase } from './database'

// Databases of a busy history take seconds to write on a shared machine.
vi.setConfig({ testTimeout: 120_000, hookTimeout: 120_000 })

const NOW = new Date('2026-11-20T12:00:00Z')

describe('fifty thousand bookings', () => {
  let db: Knex
  let close: () => Promise<void>
  beforeAll(async () => {
    ;({ db, close } = await demoDatabase())
    await seedHistory(db, { jobs: 1500, days: 731, seed: 5, bookings: 50_000, now: NOW })
  }, 120_000)
  afterAll(() => close())

  it('lists every payment (no list of ids too long for SQLite), pages it, and totals it', async () => {
    const withCheckout = Number((await db('bookings').whereNotNull('checkout_session_id').count({ n: '*' }).first())!.n)
    expect(withCheckout).toBeGreaterThan(49_000)
    const all = await listPayments(db, {})
    expect(all).toHaveLength(withCheckout)
    expect(all.reduce((n, p) => n + p.events.length, 0)).toBe(Number((await db('payment_ledger').whereNotNull('booking_id').count({ n: '*' }).first())!.n))
    const page = await listPaymentsPage(db, { state: 'captured' }, { limit: 50 })
    expect(page.items).toHaveLength(50)
    expect(page.items.every((p) => p.state === 'captured')).toBe(true)
    const [totals] = await paymentTotals(db, {})
    expect(totals!.capturedMinor).toBe(all.reduce((n, p) => n + p.capturedMinor, 0))
    expect(totals!.refundedMinor).toBe(all.reduce((n, p) => n + p.refundedMinor, 0))
  }, 60_000)

  it('filters by the same state the rows show (the column kept by the ledger’s triggers against paymentStateOf, on every booking)', async () => {
    const all = await listPayments(db, {})
    const column = new Map((await db('bookings').select('id', 'payment_state')).map((r: { id: number; payment_state: string }) => [r.id, r.payment_state]))
    const differing = all.filter((p) => column.get(p.bookingId) !== p.state)
    expect(differing).toEqual([])
    expect(new Set(all.map((p) => p.state)).size).toBeGreaterThanOrEqual(4)
  }, 60_000)
})

describe('the run sheet of a busy day', () => {
  let db: Knex
  let close: () => Promise<void>
  beforeAll(async () => {
    ;({ db, close } = await demoDatabase())
    await seedHistory(db, { jobs: 400, days: 20, seed: 9, now: NOW })
  }, 60_000)
  afterAll(() => close())

  it('reads a day’s run sheet in a fixed number of queries', async () => {
    const day = (await db('bookings').where({ status: 'confirmed', kind: 'job', cutter_id: 1 }).where('starts_at', '>', NOW.toISOString()).select(db.raw('substr(starts_at, 1, 10) as day')).groupBy('day').orderByRaw('count(*) desc').first()).day
    let queries = 0
    const count = () => queries++
    db.on('query', count)
    const sheet = await runSheet(db, { cutterId: 1 }, day)
    db.off('query', count)
    expect(sheet.entries.length + sheet.collected.length).toBeGreaterThanOrEqual(10)
    // The day, the cutters and their bookings that day, the bookings with their jobs and members, files and revisions,
    // timers, problems, ledger, balances, warning sites; then the catalog and the calibration once per material the
    // cutter cuts, however many jobs use it. Reading each job on its own took about nine queries a job.
    const materials = Number((await db('process_settings').where({ cutter_id: 1 }).count({ n: '*' }).first())!.n)
    expect(queries, `${sheet.entries.length + sheet.collected.length} entries`).toBeLessThanOrEqual(16 + 6 * materials)
  })
})

describe('the lower bound on a cutter’s bookings', () => {
  let db: Knex
  let close: () => Promise<void>
  beforeAll(async () => {
    ;({ db, close } = await demoDatabase())
  })
  afterAll(() => close())

  it('still sees a long booking that began long before the time asked about', async () => {
    const block = { cutter_id: 1, kind: 'block', status: 'confirmed', note: 'Tube replacement' }
    // Forty days from 1 January 2027, then a one-hour booking: the block is the cutter's longest.
    await db('bookings').insert({ ...block, starts_at: '2027-01-01T00:00:00.000Z', ends_at: '2027-02-10T00:00:00.000Z', ical_uid: 'long' })
    await db('bookings').insert({ ...block, starts_at: '2027-03-01T09:00:00.000Z', ends_at: '2027-03-01T10:00:00.000Z', ical_uid: 'short' })
    expect(await db('booking_spans').where({ cutter_id: 1 }).first('longest_s')).toEqual({ longest_s: 40 * 86_400 + 1 })
    // The trigger refuses an overlap on day 30 of the block, and allows the minute after it.
    await expect(db('bookings').insert({ ...block, starts_at: '2027-01-30T10:00:00.000Z', ends_at: '2027-01-30T11:00:00.000Z', ical_uid: 'inside' })).rejects.toThrow('booking_overlap')
    await db('bookings').insert({ ...block, starts_at: '2027-02-10T00:00:00.000Z', ends_at: '2027-02-10T01:00:00.000Z', ical_uid: 'after' })
    // Moving a booking is checked the same way.
    await expect(db('bookings').where({ ical_uid: 'short' }).update({ starts_at: '2027-02-09T09:00:00.000Z', ends_at: '2027-02-09T10:00:00.000Z' })).rejects.toThrow('booking_overlap')
    const staff = { id: 2, email: 'staff@example.test', name: 'Staff', role: 'staff' as const }
    const seen = await listBookings(db, staff, { cutterId: 1, from: '2027-01-29T00:00:00.000Z', to: '2027-01-31T00:00:00.000Z' })
    expect(seen.map((b) => b.note)).toEqual(['Tube replacement'])
  })
})

describe('the history generator', () => {
  const TABLES = ['users', 'sign_offs', 'jobs', 'job_files', 'file_revisions', 'job_events', 'bookings', 'payment_ledger', 'mail_outbox', 'cut_timer_events', 'cut_problems']
  async function dump(seed: number) {
    const { db, close } = await demoDatabase()
    await seedHistory(db, { jobs: 120, days: 60, seed, now: NOW })
    // The history's rows (the demo's own are written at the real time, after NOW).
    const rows = Object.fromEntries(await Promise.all(TABLES.map(async (t) => [t, await db(t).where('created_at', '<', '2026-11-25').orderBy('id')])))
    await close()
    return rows
  }

  it('writes the same rows for the same seed, and other rows for another', async () => {
    const first = await dump(3)
    expect(await dump(3)).toEqual(first)
    expect((await dump(4)).jobs).not.toEqual(first.jobs)
  })

  it('gives the demo half a year with jobs in most states, bookings, payments and logged minutes', async () => {
    const { db, close } = await demoDatabase({ history: true })
    const states = (await db('jobs').distinct('state').pluck('state')) as string[]
    expect(states).toEqual(expect.arrayContaining(['draft', 'submitted', 'changes_requested', 'approved', 'booked', 'cut', 'ready', 'collected', 'withdrawn']))
    expect(Number((await db('jobs').whereNotNull('actual_minutes').count({ n: '*' }).first())!.n)).toBeGreaterThan(80)
    expect((await db('payment_ledger').distinct('kind').pluck('kind')).sort()).toEqual(expect.arrayContaining(['authorised', 'captured', 'refunded', 'released']))
    // The demo's own members have a past too.
    expect(await db('jobs as j').join('users as u', 'u.id', 'j.member_id').where('u.email', 'member@example.test').first('j.id')).toBeTruthy()
    await close()
  })
})

describe('the payment state column', () => {
  it('is paymentStateOf for any ledger, however its rows arrive or go', async () => {
    const { db, close } = await demoDatabase()
    const kinds: LedgerKind[] = ['authorised', 'captured', 'fee', 'released', 'refunded', 'charged', 'owed']
    const ledger = fc.array(fc.record({ kind: fc.constantFrom(...kinds), amount_minor: fc.integer({ min: 0, max: 5000 }) }), { maxLength: 6 })
    const [bookingId] = await db('bookings').insert({ cutter_id: 1, kind: 'block', starts_at: '2027-05-01T09:00:00.000Z', ends_at: '2027-05-01T10:00:00.000Z', status: 'cancelled', ical_uid: 'ledger-state' })
    let key = 0
    await fc.assert(
      fc.asyncProperty(ledger, fc.nat(), async (rows, drop) => {
        await db('payment_ledger').delete()
        for (const row of rows) await db('payment_ledger').insert({ ...row, booking_id: bookingId, currency: 'EUR', stripe_object_id: 'pi', ledger_key: `k${key++}` })
        const state = async () => (await db('bookings').where({ id: bookingId }).first('payment_state')).payment_state
        expect(await state()).toBe(paymentStateOf(rows).state)
        // A row removed (a correction by hand) is taken back out of the state.
        if (rows.length) {
          const ids = (await db('payment_ledger').orderBy('id').pluck('id')) as number[]
          await db('payment_ledger').where({ id: ids[drop % ids.length] }).delete()
          expect(await state()).toBe(paymentStateOf(rows.filter((_, i) => i !== drop % ids.length)).state)
        }
      }),
      { numRuns: 200 },
    )
    await close()
  }, 60_000)
})
