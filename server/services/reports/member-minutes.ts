import type { Knex } from 'knex'
import type { MemberMinutesReport, MemberMinutesRow } from '#shared/schemas/reports'
import { finishedJobsQuery, jobBookings } from './activity'
import { overlapMinutes, reportOf, type ReportRange } from './range'
import { rounded } from './statistics'

/**
 * Per member: live job bookings touching the range and their minutes inside it (the same minutes as
 * the utilisation's booked column), and the jobs finished in the range with the minutes logged for them.
 */
export async function memberMinutesReport(db: Knex, range: ReportRange): Promise<MemberMinutesReport> {
  const bookings = await jobBookings(db, range)
  // Finished jobs are counted and summed per member in the database.
  const cut: { member_id: number; jobs: number | string; minutes: number | string }[] = await db.from(finishedJobsQuery(db, range).as('f')).groupBy('f.member_id').select('f.member_id').count({ jobs: '*' }).sum({ minutes: 'f.actual_minutes' })
  const memberIds = [...new Set([...bookings.map((b) => b.member_id), ...cut.map((c) => c.member_id)])]
  const names = new Map<number, string>((await db('users').whereIn('id', memberIds).select('id', 'name')).map((u: { id: number; name: string }) => [u.id, u.name]))
  const rows = new Map<number, MemberMinutesRow>(memberIds.map((id) => [id, { memberId: id, memberName: names.get(id) ?? '', bookings: 0, bookedMinutes: 0, finishedJobs: 0, cutMinutes: 0 }]))
  const interval = { start: range.fromIso, end: range.toIso }
  for (const booking of bookings) {
    const row = rows.get(booking.member_id)!
    row.bookings += 1
    row.bookedMinutes += overlapMinutes(booking.starts_at, booking.ends_at, interval)
  }
  for (const member of cut) {
    const row = rows.get(member.member_id)!
    row.finishedJobs = Number(member.jobs)
    row.cutMinutes = Number(member.minutes)
  }
  const ordered = [...rows.values()]
    .map((row) => ({ ...row, bookedMinutes: rounded(row.bookedMinutes, 2)!, cutMinutes: rounded(row.cutMinutes, 2)! }))
    .sort((a, b) => b.bookedMinutes - a.bookedMinutes || b.cutMinutes - a.cutMinutes || a.memberName.localeCompare(b.memberName))
  return reportOf(range, ordered)
}
