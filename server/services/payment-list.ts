import type { Knex } from 'knex'
import type { Page, PageQuery } from '#shared/schemas/paging'
import { keysetPage, mapPage } from '../utils/paging'
import { nowIso } from '../utils/rows'
import { paymentStateOf, type LedgerKind, type LedgerRow, type PaymentState } from './payments'

// The payments lists (a member's own, the admin's every one): bookings with a checkout, newest first, each with
// its ledger. Rows are joined, never looked up by a list of ids, and the state filter reads a column through an
// index, so a page costs the same with fifty thousand bookings as with fifty.

export interface PaymentView {
  bookingId: number
  /** While the booking waits for payment: where to pay. */
  payUrl: string | null
  jobTitle: string | null
  memberName: string | null
  start: string
  state: PaymentState
  authorisedMinor: number
  capturedMinor: number
  refundedMinor: number
  /** Still owed after the cut (the hold did not cover it); paid with a second checkout. */
  balanceMinor: number
  currency: string
  events: { kind: LedgerKind; amountMinor: number; at: string; note: string }[]
}

export interface PaymentFilter {
  memberId?: number
  from?: string
  to?: string
  state?: PaymentState
}

const sumOf = (kinds: LedgerKind[]) => `sum(case when kind in (${kinds.map((k) => `'${k}'`).join(', ')}) then amount_minor else 0 end)`

function paymentQuery(db: Knex, filter: PaymentFilter) {
  const query = db('bookings as b')
    .leftJoin('jobs as j', 'j.id', 'b.job_id')
    .leftJoin('users as u', 'u.id', 'b.member_id')
    .whereNotNull('b.checkout_session_id')
    .select('b.id', 'b.starts_at', 'b.currency', 'b.status', 'b.checkout_url', 'b.hold_expires_at', 'j.title', 'u.name')
  if (filter.memberId) query.where('b.member_id', filter.memberId)
  if (filter.from) query.where('b.starts_at', '>=', new Date(filter.from).toISOString())
  if (filter.to) query.where('b.starts_at', '<', new Date(filter.to).toISOString())
  // The state column is kept by triggers on the ledger (migration 0013), the rule of paymentStateOf.
  if (filter.state) query.where('b.payment_state', filter.state)
  return query
}

interface BookingRow {
  id: number
  starts_at: string
  currency: string | null
  status: string
  checkout_url: string | null
  hold_expires_at: string | null
  title: string | null
  name: string | null
}

function toView(b: BookingRow, rows: LedgerRow[]): PaymentView {
  const waiting = b.status === 'held' && !!b.hold_expires_at && b.hold_expires_at > nowIso()
  return {
    bookingId: b.id,
    payUrl: waiting ? b.checkout_url : null,
    jobTitle: b.title,
    memberName: b.name,
    start: b.starts_at,
    ...paymentStateOf(rows),
    balanceMinor: Math.max(0, rows.reduce((n, r) => n + (r.kind === 'owed' ? r.amount_minor : r.kind === 'charged' ? -r.amount_minor : 0), 0)),
    currency: b.currency ?? 'EUR',
    events: rows.map((r) => ({ kind: r.kind, amountMinor: r.amount_minor, at: r.created_at, note: r.note })),
  }
}

function byBooking(ledger: LedgerRow[]): Map<number, LedgerRow[]> {
  const map = new Map<number, LedgerRow[]>()
  for (const row of ledger) {
    const list = map.get(row.booking_id!)
    if (list) list.push(row)
    else map.set(row.booking_id!, [row])
  }
  return map
}

/** The whole list (the CSV, and callers that ask for no pages): the ledger comes by a join with the same filter. */
export async function listPayments(db: Knex, filter: PaymentFilter): Promise<PaymentView[]> {
  const bookings: BookingRow[] = await paymentQuery(db, filter).orderBy([{ column: 'b.starts_at', order: 'desc' }, { column: 'b.id', order: 'desc' }])
  const ledger: LedgerRow[] = await db('payment_ledger as l').join(paymentQuery(db, filter).clearSelect().select('b.id').as('f'), 'f.id', 'l.booking_id').orderBy('l.id').select('l.*')
  const rowsOf = byBooking(ledger)
  return bookings.map((b) => toView(b, rowsOf.get(b.id) ?? []))
}

/** One page of the list; the ledger is read for the page's bookings only. */
export async function listPaymentsPage(db: Knex, filter: PaymentFilter, page: Required<Pick<PageQuery, 'limit'>> & Pick<PageQuery, 'cursor'>): Promise<Page<PaymentView>> {
  const order = { columns: ['b.starts_at', 'b.id'], direction: 'desc' as const, keyOf: (b: BookingRow) => [b.starts_at, b.id] }
  return mapPage(await keysetPage<BookingRow>(paymentQuery(db, filter), order, page), async (bookings) => {
    const rowsOf = byBooking(await db<LedgerRow>('payment_ledger').whereIn('booking_id', bookings.map((b) => b.id)).orderBy('id'))
    return bookings.map((b) => toView(b, rowsOf.get(b.id) ?? []))
  })
}

export interface PaymentTotals {
  currency: string
  capturedMinor: number
  refundedMinor: number
}

/** Charged and refunded over every payment the filter selects, per currency (the admin page's totals, whatever page is shown). */
export async function paymentTotals(db: Knex, filter: PaymentFilter): Promise<PaymentTotals[]> {
  const rows = await db('payment_ledger as l')
    .join(paymentQuery(db, filter).clearSelect().select('b.id').as('f'), 'f.id', 'l.booking_id')
    .groupBy('l.currency')
    .select('l.currency', db.raw(`${sumOf(['captured', 'fee', 'charged'])} as captured`), db.raw(`${sumOf(['refunded'])} as refunded`))
  return rows.map((r: { currency: string; captured: number | string; refunded: number | string }) => ({
    currency: r.currency,
    capturedMinor: Number(r.captured),
    refundedMinor: Number(r.refunded),
  }))
}
