import type { Knex } from 'knex'
import type { MemberMinutesReport, MemberMinutesRow } from '#shared/schemas/reports'
import { finishedJobs, jobBookings } from './activity'
import { overlapMinutes, reportOf, type ReportRange } from './range'
import { rounded } from './statistics'

/**
 * Per member: live job bookings touching the range and their minutes inside it (the same minutes as
 * the utilisation's booked column), and the jobs finished in the range with the minutes logged for them.
 */
export async function memberMinutesReport(db: Knex, range: ReportRange): Promise<MemberMinutesReport> {
  const bookings = await jobBookings(db, range)
  const jobs = await finishedJobs(db, range)
  const memberIds = [...new Set([...bookings.map((b) => b.member_id), ...jobs.map((j) => j.member_id)])]
  const names = new Map<number, string>((await db('users').whereIn('id', memberIds).select('id', 'name')).map((u: { id: number; name: string }) => [u.id, u.name]))
  const rows = new Map<number, MemberMinutesRow>(memberIds.map((id) => [id, { memberId: id, memberName: names.get(id) ?? '', bookings: 0, bookedMinutes: 0, finishedJobs: 0, cutMinutes: 0 }]))
  const interval = { start: range.fromIso, end: range.toIso }
  for (const booking of bookings) {
    const row = rows.get(booking.member_id)!
    row.bookings += 1
    row.bookedMinutes += overlapMinutes(booking.starts_at, booking.ends_at, interval)
  }
  for (const job of jobs) {
    const row = rows.get(job.member_id)!
    row.finishedJobs += 1
    row.cutMinutes += job.actual_minutes
  }
  const ordered = [...rows.values()]
    .map((row) => ({ ...row, bookedMinutes: rounded(row.bookedMinutes, 2)!, cutMinutes: rounded(row.cutMinutes, 2)! }))
    .sort((a, b) => b.bookedMinutes - a.bookedMinutes || b.cutMinutes - a.cutMinutes || a.memberName.localeCompare(b.memberName))
  return reportOf(range, ordered)
}
