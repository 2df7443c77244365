import type { Knex } from 'knex'
import type { RevenueReport, RevenueRow } from '#shared/schemas/reports'
import type { LedgerKind } from '../payments'
import { reportOf, weekOf, type ReportRange } from './range'

// Money that stays with the workshop. `authorised` and `released` only hold and free a card amount.
const REVENUE_SIGN: Partial<Record<LedgerKind, 1 | -1>> = { captured: 1, fee: 1, charged: 1, refunded: -1 }
const KIND_COLUMN = { captured: 'capturedMinor', fee: 'feeMinor', charged: 'chargedMinor', refunded: 'refundedMinor' } as const

/**
 * Revenue per ISO week (of the ledger entry, in the workshop's zone), cutter and currency:
 * captured + fee + charged − refunded, in integer minor units. The cutter is the booking's, else the job's.
 */
export async function revenueReport(db: Knex, range: ReportRange): Promise<RevenueReport> {
  const query = db('payment_ledger as l')
    .leftJoin('bookings as b', 'b.id', 'l.booking_id')
    .leftJoin('jobs as j', 'j.id', 'l.job_id')
    .join('cutters as c', 'c.id', db.raw('coalesce(b.cutter_id, j.cutter_id)'))
    .whereIn('l.kind', Object.keys(REVENUE_SIGN))
    .where('l.created_at', '>=', range.fromIso)
    .where('l.created_at', '<', range.toIso)
    .select('l.kind', 'l.amount_minor', 'l.currency', 'l.created_at', 'c.id as cutter_id', 'c.name as cutter_name')
  if (range.cutterId) query.where('c.id', range.cutterId)
  const entries: { kind: keyof typeof KIND_COLUMN; amount_minor: number; currency: string; created_at: string; cutter_id: number; cutter_name: string }[] = await query
  const rows = new Map<string, RevenueRow>()
  for (const entry of entries) {
    const { week, weekStart } = weekOf(entry.created_at, range.zone)
    const key = `${week}|${entry.cutter_id}|${entry.currency}`
    let row = rows.get(key)
    if (!row) {
      row = { week, weekStart, cutterId: entry.cutter_id, cutterName: entry.cutter_name, currency: entry.currency, capturedMinor: 0, feeMinor: 0, chargedMinor: 0, refundedMinor: 0, revenueMinor: 0 }
      rows.set(key, row)
    }
    row[KIND_COLUMN[entry.kind]] += entry.amount_minor
    row.revenueMinor += REVENUE_SIGN[entry.kind]! * entry.amount_minor
  }
  const ordered = [...rows.values()].sort((a, b) => a.week.localeCompare(b.week) || a.cutterName.localeCompare(b.cutterName) || a.currency.localeCompare(b.currency))
  return reportOf(range, ordered)
}
