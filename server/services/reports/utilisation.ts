import type { Knex } from 'knex'
import type { UtilisationReport } from '#shared/schemas/reports'
import { cutterAvailability } from '../bookings'
import type { UtcInterval } from '../workshop-time'
import { finishedJobs, jobBookings } from './activity'
import { overlapMinutes, reportOf, weekOf, type ReportRange } from './range'
import { rounded } from './statistics'

/** What is left of an interval once the closures are cut out of it. */
export function withoutClosures(interval: UtcInterval, closures: UtcInterval[]): UtcInterval[] {
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
 */
export async function utilisationReport(db: Knex, range: ReportRange): Promise<UtilisationReport> {
  const open = await openIntervals(db, range)
  const bookings = await jobBookings(db, range)
  const cuts = await finishedJobs(db, range)
  const rows = range.weeks.map((week) => {
    const openMinutes = open.reduce((sum, i) => sum + overlapMinutes(i.start, i.end, week), 0)
    const bookedMinutes = bookings.reduce((sum, b) => sum + overlapMinutes(b.starts_at, b.ends_at, week), 0)
    const cuttingMinutes = cuts.filter((j) => weekOf(j.finished_at, range.zone).week === week.week).reduce((sum, j) => sum + j.actual_minutes, 0)
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
