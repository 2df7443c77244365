import type { Knex } from 'knex'
import { addMinutes } from './workshop-time'

/**
 * The earliest start a booking touching `fromIso` can have: `fromIso` less the longest booking ever made on
 * the cutter (on any cutter when none is named), which `booking_spans` keeps (migration 0013). A read of the
 * bookings round a time adds `starts_at > this`, so it walks only the bookings near that time.
 */
export async function earliestStartTouching(db: Knex, fromIso: string, cutterId?: number | null): Promise<string> {
  const query = db('booking_spans').max({ longest: 'longest_s' })
  if (cutterId) query.where({ cutter_id: cutterId })
  const row = (await query.first()) as { longest: number | null } | undefined
  return addMinutes(fromIso, -Number(row?.longest ?? 0) / 60)
}
