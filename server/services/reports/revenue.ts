import type { Knex } from 'knex'
import type { RevenueReport, RevenueRow } from '#shared/schemas/reports'
import type { LedgerKind } from '../payments'
import { reportOf, weeksTable, type ReportRange } from './range'

// Money that stays with the workshop. `authorised` and `released` only hold and free a card amount.
const REVENUE_SIGN: Partial<Record<LedgerKind, 1 | -1>> = { captured: 1, fee: 1, charged: 1, refunded: -1 }
const KIND_COLUMN = { captured: 'capturedMinor', fee: 'feeMinor', charged: 'chargedMinor', refunded: 'refundedMinor' } as const

/**
 * Revenue per ISO week (of the ledger entry, in the workshop's zone), cutter and currency:
 * captured + fee + charged − refunded, in integer minor units. The cutter is the booking's, else the job's.
 * Summed in the database: each entry is joined to its week (a range lookup on the ledger's created_at index)
 * and grouped, so only the sums travel.
 */
export async function revenueReport(db: Knex, range: ReportRange): Promise<RevenueReport> {
  const query = db
    .with('weeks', weeksTable(db, range))
    .from('weeks as w')
    .join('payment_ledger as l', (on) => on.on('l.created_at', '>=', 'w.start_at').andOn('l.created_at', '<', 'w.end_at'))
    .leftJoin('bookings as b', 'b.id', 'l.booking_id')
    .leftJoin('jobs as j', 'j.id', 'l.job_id')
    .join('cutters as c', 'c.id', db.raw('coalesce(b.cutter_id, j.cutter_id)'))
    .whereIn('l.kind', Object.keys(REVENUE_SIGN))
    .groupBy('w.week_index', 'c.id', 'c.name', 'l.currency', 'l.kind')
    .select('w.week_index', 'c.id as cutter_id', 'c.name as cutter_name', 'l.currency', 'l.kind')
    .sum({ amount: 'l.amount_minor' })
  if (range.cutterId) query.where('c.id', range.cutterId)
  const sums: {
    week_index: number | string
    kind: keyof typeof KIND_COLUMN
    amount: number | string
    currency: string
    cutter_id: number
    cutter_name: string
  }[] = await query
  const rows = new Map<string, RevenueRow>()
  for (const sum of sums) {
    const { week, weekStart } = range.weeks[Number(sum.week_index)]!
    const key = `${week}|${sum.cutter_id}|${sum.currency}`
    let row = rows.get(key)
    if (!row) {
      row = {
        week,
        weekStart,
        cutterId: sum.cutter_id,
        cutterName: sum.cutter_name,
        currency: sum.currency,
        capturedMinor: 0,
        feeMinor: 0,
        chargedMinor: 0,
        refundedMinor: 0,
        revenueMinor: 0,
      }
      rows.set(key, row)
    }
    row[KIND_COLUMN[sum.kind]] += Number(sum.amount)
    row.revenueMinor += REVENUE_SIGN[sum.kind]! * Number(sum.amount)
  }
  const ordered = [...rows.values()].sort(
    (a, b) => a.week.localeCompare(b.week) || a.cutterName.localeCompare(b.cutterName) || a.currency.localeCompare(b.currency),
  )
  return reportOf(range, ordered)
}
