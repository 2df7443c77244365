import { DateTime, IANAZone } from 'luxon'

// Wall-clock rules (opening hours, the booking grid, weeks) are in the workshop's IANA time zone;
// everything stored is UTC. Luxon does the conversion, daylight-saving changes included.

export interface OpeningPeriod {
  weekday: number
  opensAt: string
  closesAt: string
}

export interface UtcInterval {
  start: string
  end: string
}

export function inZone(iso: string, zone: string): DateTime {
  return DateTime.fromISO(iso, { zone: 'utc' }).setZone(zone)
}

export function toUtcIso(dateTime: DateTime): string {
  return dateTime.toUTC().toISO({ suppressMilliseconds: false })!
}

/** A wall-clock time on a local date, as a UTC instant. */
export function localToUtc(localDate: DateTime, clock: string, zone: string): string {
  const [hour, minute] = clock.split(':').map(Number)
  return toUtcIso(DateTime.fromObject({ year: localDate.year, month: localDate.month, day: localDate.day, hour, minute }, { zone }))
}

/**
 * The opening periods of every local day touching [fromIso, toIso), as UTC intervals. Dates are walked as plain
 * calendar days; a day whose UTC offset stays the same throughout converts its wall-clock times by that offset,
 * and only a day with a daylight-saving change goes through Luxon (two years of days: milliseconds, not a second).
 */
export function openingIntervals(periods: OpeningPeriod[], zone: string, fromIso: string, toIso: string): UtcInterval[] {
  const intervals: UtcInterval[] = []
  const tz = IANAZone.create(zone)
  const byWeekday = new Map<number, OpeningPeriod[]>()
  for (const p of periods) byWeekday.set(p.weekday, [...(byWeekday.get(p.weekday) ?? []), p])
  const first = inZone(fromIso, zone).startOf('day')
  const endMs = Date.parse(toIso)
  const clockMs = (clock: string) => {
    const [hour, minute] = clock.split(':').map(Number)
    return (hour! * 60 + minute!) * 60_000
  }
  const firstDate = Date.UTC(first.year, first.month - 1, first.day)
  // The zone's offset sampled once a week; three equal samples in a row mean no change in the days between
  // (time zones change their offset months apart, never twice within two weeks).
  const samples = new Map<number, number>()
  const sample = (week: number) => samples.get(week) ?? samples.set(week, tz.offset(firstDate + week * 7 * DAY_MS - 14 * HOUR_MS)).get(week)!
  for (let date = firstDate; ; date += DAY_MS) {
    // Every instant of this local day lies between 14 h before and 38 h after its date at 00:00 UTC.
    const week = Math.floor((date - firstDate) / (7 * DAY_MS))
    const quiet = sample(week) === sample(week + 1) && sample(week + 1) === sample(week + 2)
    const offset = quiet ? sample(week) : tz.offset(date - 14 * HOUR_MS)
    const steady = quiet || offset === tz.offset(date + 38 * HOUR_MS)
    const localDay = steady ? null : DateTime.fromMillis(date, { zone: 'utc' }).setZone(zone, { keepLocalTime: true })
    const midnightMs = steady ? date - offset * 60_000 : localDay!.toMillis()
    if (midnightMs >= endMs) break
    const weekday = ((new Date(date).getUTCDay() + 6) % 7) + 1
    for (const p of byWeekday.get(weekday) ?? []) {
      if (steady) {
        intervals.push({
          start: new Date(date + clockMs(p.opensAt) - offset * 60_000).toISOString(),
          end: new Date(date + clockMs(p.closesAt) - offset * 60_000).toISOString(),
        })
      } else {
        intervals.push({ start: localToUtc(localDay!, p.opensAt, zone), end: localToUtc(localDay!, p.closesAt, zone) })
      }
    }
  }
  return intervals.filter((i) => i.end > fromIso && i.start < toIso)
}

const HOUR_MS = 3_600_000
const DAY_MS = 24 * HOUR_MS

/** Monday 00:00 to the next Monday 00:00, local, around an instant — the week for the weekly limit. */
export function localWeek(iso: string, zone: string): UtcInterval {
  const start = inZone(iso, zone).startOf('week')
  return { start: toUtcIso(start), end: toUtcIso(start.plus({ weeks: 1 })) }
}

/** True when the instant falls on the booking grid of `granularityMinutes` from local midnight. */
export function onGrid(iso: string, zone: string, granularityMinutes: number): boolean {
  const local = inZone(iso, zone)
  return local.second === 0 && local.millisecond === 0 && (local.hour * 60 + local.minute) % granularityMinutes === 0
}

export function minutesBetween(startIso: string, endIso: string): number {
  return (Date.parse(endIso) - Date.parse(startIso)) / 60_000
}

export function addMinutes(iso: string, minutes: number): string {
  return new Date(Date.parse(iso) + minutes * 60_000).toISOString()
}

export function describeLocal(iso: string, zone: string): string {
  return inZone(iso, zone).toFormat('cccc d LLLL yyyy, HH:mm')
}
