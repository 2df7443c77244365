import type { Knex } from 'knex'
import { DateTime } from 'luxon'
import { REPORT_DEFAULT_WEEKS, defaultReportRange, type ReportQuery, type WeekColumns } from '#shared/schemas/reports'
import { workshopSettings } from '../settings'
import { inZone, minutesBetween, toUtcIso, type UtcInterval } from '../workshop-time'

export interface ReportWeek extends WeekColumns, UtcInterval {}

/** The report's local dates as UTC instants [fromIso, toIso), and its ISO weeks clipped to them. */
export interface ReportRange {
  from: string
  to: string
  fromIso: string
  toIso: string
  zone: string
  cutterId: number | null
  weeks: ReportWeek[]
}

const weekColumns = (monday: DateTime): WeekColumns => ({ week: monday.toFormat("kkkk-'W'WW"), weekStart: monday.toISODate()! })

const localMidnight = (date: string, zone: string) => DateTime.fromISO(date, { zone }).startOf('day')

export async function resolveRange(db: Knex, query: Omit<ReportQuery, 'format'>): Promise<ReportRange> {
  const zone = (await workshopSettings(db)).timeZone
  const fallback = defaultReportRange(DateTime.now().setZone(zone).toISODate()!)
  const span = { weeks: REPORT_DEFAULT_WEEKS }
  // One end given alone: the other lies the default span away.
  const from = query.from ?? (query.to ? localMidnight(query.to, zone).minus(span).toISODate()! : fallback.from)
  const to = query.to ?? (query.from ? localMidnight(query.from, zone).plus(span).toISODate()! : fallback.to)
  const fromIso = toUtcIso(localMidnight(from, zone))
  const toIso = toUtcIso(localMidnight(to, zone))
  const weeks: ReportWeek[] = []
  for (let monday = localMidnight(from, zone).startOf('week'); toUtcIso(monday) < toIso; monday = monday.plus({ weeks: 1 })) {
    const start = toUtcIso(monday)
    const end = toUtcIso(monday.plus({ weeks: 1 }))
    weeks.push({ ...weekColumns(monday), start: start < fromIso ? fromIso : start, end: end > toIso ? toIso : end })
  }
  return { from, to, fromIso, toIso, zone, cutterId: query.cutter ?? null, weeks }
}

/** The ISO week (e.g. 2026-W19, starting Monday 2026-05-04) of an instant in the workshop's zone. */
export function weekOf(iso: string, zone: string): WeekColumns {
  return weekColumns(inZone(iso, zone).startOf('week'))
}

/** The index of the range's week holding the instant (−1 outside the range): a binary search over the week starts, no date arithmetic per row. */
export function weekIndexOf(range: Pick<ReportRange, 'weeks'>, iso: string): number {
  const { weeks } = range
  if (!weeks.length || iso < weeks[0]!.start || iso >= weeks[weeks.length - 1]!.end) return -1
  let low = 0
  let high = weeks.length - 1
  while (low < high) {
    const middle = (low + high + 1) >> 1
    if (weeks[middle]!.start <= iso) low = middle
    else high = middle - 1
  }
  return low
}

/** Calls `add` with each week's share, in minutes, of [start, end): the weeks it touches only. */
export function spreadOverWeeks(range: Pick<ReportRange, 'weeks'>, start: string, end: string, add: (weekIndex: number, minutes: number) => void): void {
  const { weeks } = range
  if (!weeks.length) return
  for (let i = Math.max(0, weekIndexOf(range, start > weeks[0]!.start ? start : weeks[0]!.start)); i < weeks.length && weeks[i]!.start < end; i++) {
    const minutes = overlapMinutes(start, end, weeks[i]!)
    if (minutes > 0) add(i, minutes)
  }
}

/**
 * The range's weeks as a table for SQL (week_index, start_at, end_at), so a report can join its rows to their
 * week and group them in the database. Plain `select … union all`, which SQLite and PostgreSQL both read; the casts
 * give PostgreSQL the parameters' types, which it can't infer in a select list.
 */
export function weeksTable(db: Knex, range: Pick<ReportRange, 'weeks'>): Knex.Raw {
  const weeks = range.weeks.length ? range.weeks : [{ start: '', end: '' }]
  return db.raw(weeks.map(() => 'select cast(? as integer) as week_index, cast(? as text) as start_at, cast(? as text) as end_at').join(' union all '), weeks.flatMap((w, i) => [i, w.start, w.end]))
}

/** Minutes that [start, end) shares with the interval. */
export function overlapMinutes(start: string, end: string, interval: UtcInterval): number {
  const from = start > interval.start ? start : interval.start
  const to = end < interval.end ? end : interval.end
  return to > from ? minutesBetween(from, to) : 0
}

/** The envelope every report answers with. */
export function reportOf<Row, Summary = undefined>(range: ReportRange, rows: Row[], summary?: Summary) {
  return { from: range.from, to: range.to, timeZone: range.zone, cutterId: range.cutterId, rows, summary: summary as Summary }
}
