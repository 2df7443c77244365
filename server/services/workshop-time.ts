import { DateTime } from 'luxon'

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

/** The opening periods of every local day touching [fromIso, toIso), as UTC intervals. */
export function openingIntervals(periods: OpeningPeriod[], zone: string, fromIso: string, toIso: string): UtcInterval[] {
  const intervals: UtcInterval[] = []
  let day = inZone(fromIso, zone).startOf('day')
  const last = inZone(toIso, zone)
  while (day < last) {
    for (const p of periods.filter((p) => p.weekday === day.weekday)) {
      intervals.push({ start: localToUtc(day, p.opensAt, zone), end: localToUtc(day, p.closesAt, zone) })
    }
    day = day.plus({ days: 1 })
  }
  return intervals.filter((i) => i.end > fromIso && i.start < toIso)
}

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
  return inZone(iso, zone).toFormat("cccc d LLLL yyyy, HH:mm")
}
