// openingIntervals walks calendar days and converts wall-clock times itself on days without a daylight-saving
// change; the reference here converts every day with Luxon (DateTime.fromObject in the zone), as the function did
// before. Both must agree for any hours, range and zone, daylight-saving changes, half-hour offsets and the
// 30-minute shift of Lord Howe Island and changes at midnight (Santiago, Beirut) included (zones and rules: the IANA time zone database via Intl).
import fc from 'fast-check'
import { DateTime } from 'luxon'
import { describe, expect, it } from 'vitest'
import { openingIntervals, type OpeningPeriod, type UtcInterval } from '../../../server/services/workshop-time'

function reference(periods: OpeningPeriod[], zone: string, fromIso: string, toIso: string): UtcInterval[] {
  const utc = (day: DateTime, clock: string) => {
    const [hour, minute] = clock.split(':').map(Number)
    return DateTime.fromObject({ year: day.year, month: day.month, day: day.day, hour, minute }, { zone }).toUTC().toISO()!
  }
  const intervals: UtcInterval[] = []
  let day = DateTime.fromISO(fromIso, { zone: 'utc' }).setZone(zone).startOf('day')
  const last = DateTime.fromISO(toIso, { zone: 'utc' }).setZone(zone)
  while (day < last) {
    for (const p of periods.filter((p) => p.weekday === day.weekday)) intervals.push({ start: utc(day, p.opensAt), end: utc(day, p.closesAt) })
    day = day.plus({ days: 1 })
  }
  return intervals.filter((i) => i.end > fromIso && i.start < toIso)
}

const ZONES = ['Europe/Dublin', 'America/New_York', 'Australia/Lord_Howe', 'Asia/Kolkata', 'Pacific/Chatham', 'America/St_Johns', 'Europe/Berlin', 'America/Santiago', 'Asia/Beirut', 'UTC']
const clock = fc.integer({ min: 0, max: 95 }).map((q) => `${String(Math.floor(q / 4)).padStart(2, '0')}:${String((q % 4) * 15).padStart(2, '0')}`)
const period = fc
  .tuple(fc.integer({ min: 1, max: 7 }), clock, clock)
  .filter(([, a, b]) => a < b)
  .map(([weekday, opensAt, closesAt]) => ({ weekday, opensAt, closesAt }))

describe('opening intervals', () => {
  it('match Luxon day by day for any hours, zone and range', () => {
    const anyStartHour = fc.integer({ min: 0, max: 4 * 365 * 24 })
    const anyHours = fc.integer({ min: 1, max: 400 * 24 })
    fc.assert(
      fc.property(fc.array(period, { maxLength: 8 }), fc.constantFrom(...ZONES), anyStartHour, anyHours, (periods, zone, startHour, hours) => {
        const from = Date.UTC(2024, 0, 1) + startHour * 3_600_000
        const fromIso = new Date(from).toISOString()
        const toIso = new Date(from + hours * 3_600_000).toISOString()
        expect(openingIntervals(periods, zone, fromIso, toIso)).toEqual(reference(periods, zone, fromIso, toIso))
      }),
      { numRuns: 150 },
    )
  }, 60_000)

  it('match across the night the clocks go back and forward, with hours inside the changed hour', () => {
    const periods = [1, 2, 3, 4, 5, 6, 7].flatMap((weekday) => [{ weekday, opensAt: '00:30', closesAt: '03:15' }, { weekday, opensAt: '09:00', closesAt: '17:00' }])
    for (const zone of ZONES) {
      expect(openingIntervals(periods, zone, '2026-03-20T00:00:00.000Z', '2026-04-10T00:00:00.000Z')).toEqual(reference(periods, zone, '2026-03-20T00:00:00.000Z', '2026-04-10T00:00:00.000Z'))
      expect(openingIntervals(periods, zone, '2026-09-20T00:00:00.000Z', '2026-11-10T00:00:00.000Z')).toEqual(reference(periods, zone, '2026-09-20T00:00:00.000Z', '2026-11-10T00:00:00.000Z'))
    }
  }, 60_000)
})
