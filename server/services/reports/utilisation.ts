import type { Knex } from 'knex'
import type { UtilisationReport } from '#shared/schemas/reports'
import { cutterAvailability } from '../bookings'
import type { UtcInterval } from '../workshop-time'
import { finishedJobsQuery, jobBookings } from './activity'
import { reportOf, spreadOverWeeks, weeksTable, type ReportRange } from './range'
import { rounded } from './statistics'

/** What is left of an interval once the closures are cut out of it. */
function withoutClosures(interval: UtcInterval, closures: UtcInterval[]): UtcInterval[] {
  let pieces = [interval]
  for (const closure of closures) {
    pieces = pieces.flatMap((p) => {
      if (closure.end <= p.start || closure.start >= p.end) return [p]
      return [{ start: p.start, end: closure.start }, { start: closure.end, end: p.end }].filter((rest) => rest.end > rest.start)
    })
  }
  return pieces
}

export async function cuttersInScope(db: Knex, range: ReportRange): Promise<number[]> {
  const query = db('cutters').orderBy('id').pluck('id')
  if (range.cutterId) query.where({ id: range.cutterId })
  return query
}

async function openIntervals(db: Knex, range: ReportRange): Promise<UtcInterval[]> {
  const perCutter = await Promise.all(
    (await cuttersInScope(db, range)).map(async (cutterId) => {
      const { open, closures } = await cutterAvailability(db, cutterId, range.fromIso, range.toIso)
      return open.flatMap((interval) => withoutClosures(interval, closures))
    }),
  )
  return perCutter.flat()
}

/**
 * Per ISO week, over the cutters in scope: minutes open (opening hours less closures), minutes held by
 * live job bookings (staff blocks left out), and minutes actually cut (logged at finish, in the week the cut finished).
 * Cut minutes are summed per week in the database; opening hours and bookings are added in one pass to the weeks they
 * touch, found by a binary search over the week starts.
 */
export async function utilisationReport(db: Knex, range: ReportRange): Promise<UtilisationReport> {
  const totals = range.weeks.map(() => ({ open: 0, booked: 0, cutting: 0 }))
  for (const interval of await openIntervals(db, range)) spreadOverWeeks(range, interval.start, interval.end, (i, minutes) => (totals[i]!.open += minutes))
  for (const booking of await jobBookings(db, range)) spreadOverWeeks(range, booking.starts_at, booking.ends_at, (i, minutes) => (totals[i]!.booked += minutes))
  const cutPerWeek: { week_index: number | string; minutes: number }[] = await db
    .with('weeks', weeksTable(db, range))
    .from('weeks as w')
    .join(finishedJobsQuery(db, range).as('f'), (on) => on.on('f.finished_at', '>=', 'w.start_at').andOn('f.finished_at', '<', 'w.end_at'))
    .groupBy('w.week_index')
    .select('w.week_index')
    .sum({ minutes: 'f.actual_minutes' })
  for (const week of cutPerWeek) totals[Number(week.week_index)]!.cutting = Number(week.minutes)
  const rows = range.weeks.map((week, i) => {
    const { open: openMinutes, booked: bookedMinutes, cutting: cuttingMinutes } = totals[i]!
    const percentOfOpen = (minutes: number) => (openMinutes > 0 ? rounded((minutes / openMinutes) * 100) : null)
    return {
      week: week.week,
      weekStart: week.weekStart,
      openMinutes: rounded(openMinutes, 2)!,
      bookedMinutes: rounded(bookedMinutes, 2)!,
      cuttingMinutes: rounded(cuttingMinutes, 2)!,
      bookedPercent: percentOfOpen(bookedMinutes),
      cuttingPercent: percentOfOpen(cuttingMinutes),
    }
  })
  return reportOf(range, rows)
}
