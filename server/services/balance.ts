import type { Knex } from 'knex'

export interface BalanceOwed {
  bookingId: number
  balanceMinor: number
  currency: string
}

/**
 * What a member still owes for cuts that cost more than their hold: `owed` ledger entries less the `charged`
 * payments of the second checkout, per booking. Only bookings with something owed are listed.
 */
export async function balancesOwed(db: Knex, where: { bookingId?: number; bookingIds?: number[]; jobId?: number; memberId?: number }): Promise<BalanceOwed[]> {
  const query = db('payment_ledger')
    .whereIn('kind', ['owed', 'charged'])
    .groupBy('booking_id', 'currency')
    .select('booking_id', 'currency', db.raw("sum(case when kind = 'owed' then amount_minor else -amount_minor end) as balance"))
  if (where.bookingId) query.where('booking_id', where.bookingId)
  if (where.bookingIds) query.whereIn('booking_id', where.bookingIds)
  if (where.jobId) query.where('job_id', where.jobId)
  if (where.memberId) query.where('member_id', where.memberId)
  const rows = (await query) as { booking_id: number; currency: string; balance: number }[]
  return rows.filter((r) => r.balance > 0).map((r) => ({ bookingId: r.booking_id, balanceMinor: r.balance, currency: r.currency }))
}

/** A member's balances still to pay, each with its job's title: the overview and My payments put them first. */
export async function memberBalancesOwed(db: Knex, memberId: number): Promise<(BalanceOwed & { jobTitle: string | null })[]> {
  const owed = await balancesOwed(db, { memberId })
  const titles = (await db('bookings as b').leftJoin('jobs as j', 'j.id', 'b.job_id').whereIn('b.id', owed.map((o) => o.bookingId)).select('b.id', 'j.title')) as { id: number; title: string | null }[]
  return owed.map((o) => ({ ...o, jobTitle: titles.find((t) => t.id === o.bookingId)?.title ?? null }))
}
