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
