import { createHash, randomBytes } from 'node:crypto'
import ical, { ICalCalendarMethod, ICalEventStatus } from 'ical-generator'
import type { Knex } from 'knex'
import { NotFound } from '../utils/errors'
import { nowIso } from '../utils/rows'
import type { BookingRow } from './bookings'

// Calendar files per RFC 5545, written by ical-generator: one UID per booking for its whole life,
// SEQUENCE raised on every change, and a cancelled booking sent as METHOD:CANCEL.

interface CalendarBooking extends BookingRow {
  job_title: string | null
  cutter_name: string
}

function bookingQuery(db: Knex) {
  return db('bookings as b').join('cutters as c', 'c.id', 'b.cutter_id').leftJoin('jobs as j', 'j.id', 'b.job_id').select('b.*', 'c.name as cutter_name', 'j.title as job_title')
}

function addEvent(calendar: ReturnType<typeof ical>, booking: CalendarBooking, workshopName: string) {
  calendar.createEvent({
    id: booking.ical_uid,
    sequence: booking.ical_sequence,
    start: new Date(booking.starts_at),
    end: new Date(booking.ends_at),
    stamp: new Date(),
    summary: `${booking.cutter_name}: ${booking.job_title ?? booking.note}`,
    location: workshopName,
    description: booking.status === 'cancelled' ? `Cancelled${booking.cancel_reason ? `: ${booking.cancel_reason}` : ''}` : 'Cutter time booked with Kerfbook.',
    status: booking.status === 'cancelled' ? ICalEventStatus.CANCELLED : ICalEventStatus.CONFIRMED,
  })
}

function newCalendar(workshopName: string, method: ICalCalendarMethod) {
  return ical({ name: `${workshopName} bookings`, method, prodId: { company: 'Kerfbook', product: 'bookings', language: 'EN' } })
}

/** One booking as a calendar file: REQUEST while it stands, CANCEL once it is cancelled. */
export async function bookingIcs(db: Knex, bookingId: number, workshopName: string): Promise<string> {
  const booking = await bookingQuery(db).where('b.id', bookingId).first()
  if (!booking) throw new NotFound('No such booking.')
  const calendar = newCalendar(workshopName, booking.status === 'cancelled' ? ICalCalendarMethod.CANCEL : ICalCalendarMethod.REQUEST)
  addEvent(calendar, booking, workshopName)
  return calendar.toString()
}

/** A member's feed: every booking of the last 90 days and ahead, cancelled ones marked so. */
export async function memberFeedIcs(db: Knex, memberId: number, workshopName: string): Promise<string> {
  const since = new Date(Date.now() - 90 * 86_400_000).toISOString()
  const bookings = await bookingQuery(db).where('b.member_id', memberId).where('b.ends_at', '>', since).orderBy('b.starts_at')
  const calendar = newCalendar(workshopName, ICalCalendarMethod.PUBLISH)
  for (const booking of bookings) addEvent(calendar, booking, workshopName)
  return calendar.toString()
}

const hashToken = (token: string) => createHash('sha256').update(token).digest('hex')

/** Creates or replaces the member's private feed token; the old link stops working at once. */
export async function rotateFeedToken(db: Knex, userId: number): Promise<string> {
  const token = randomBytes(24).toString('base64url')
  await db('calendar_feeds')
    .insert({ user_id: userId, token_hash: hashToken(token) })
    .onConflict('user_id')
    .merge({ token_hash: hashToken(token), updated_at: nowIso() })
  return token
}

export async function revokeFeedToken(db: Knex, userId: number): Promise<void> {
  await db('calendar_feeds').where({ user_id: userId }).delete()
}

export async function feedOwner(db: Knex, token: string): Promise<number> {
  const row = await db('calendar_feeds').where({ token_hash: hashToken(token) }).first('user_id')
  if (!row) throw new NotFound('This calendar link was replaced or removed.')
  return row.user_id
}

export async function feedStatus(db: Knex, userId: number): Promise<{ active: boolean; since: string | null }> {
  const row = await db('calendar_feeds').where({ user_id: userId }).first('updated_at')
  return { active: !!row, since: row?.updated_at ?? null }
}
