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
export async function balancesOwed(db: Knex, where: { bookingId?: number; jobId?: number; memberId?: number }): Promise<BalanceOwed[]> {
  const query = db('payment_ledger')
    .whereIn('kind', ['owed', 'charged'])
    .groupBy('booking_id', 'currency')
    .select('booking_id', 'currency', db.raw("sum(case when kind = 'owed' then amount_minor else -amount_minor end) as balance"))
  if (where.bookingId) query.where('booking_id', where.bookingId)
  if (where.jobId) query.where('job_id', where.jobId)
  if (where.memberId) query.where('member_id', where.memberId)
  const rows = (await query) as { booking_id: number; currency: string; balance: number }[]
  return rows.filter((r) => r.balance > 0).map((r) => ({ bookingId: r.booking_id, balanceMinor: r.balance, currency: r.currency }))
}
