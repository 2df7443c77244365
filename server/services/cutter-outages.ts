import type { Knex } from 'knex'
import type { SessionUser } from '#shared/roles'
import type { OutageChangeInput, OutageCreateInput } from '#shared/schemas/outages'
import { InvalidInput, NotFound } from '../utils/errors'
import { nowIso } from '../utils/rows'
import { cancellingNow, inBookingTransaction, liveBookings, suggestSlots, type BookingRow } from './bookings'
import { getCutter, type Cutter } from './catalog/cutters'
import { sendOutageMail } from './cutter-outage-mail'
import { outagesOverlapping, toOutagePeriod, type OutagePeriod } from './cutter-outage-periods'
import { transitionJob } from './job-states'
import { settleCancellation } from './payments'
import { workshopSettings } from './settings'
import { minutesBetween } from './workshop-time'
import { insertedId } from '../../db/dialect'

export interface CalledOffBooking {
  bookingId: number
  jobId: number
  jobTitle: string
  memberName: string
  start: string
  /** False when the payment service could not be reached: the hold then lapses on its own (card networks keep it about a week). */
  holdReleased: boolean
}

/** A booking row with the payment columns the member's mail speaks of. */
type BookingWithPayment = BookingRow & {
  cancelling_since: string | null
  authorised_minor: number | null
  currency: string | null
  payment_intent_id: string | null
}

interface CalledOffRow {
  booking: BookingWithPayment
  title: string
  memberName: string
}

export interface OutageResult {
  outage: OutagePeriod
  calledOff: CalledOffBooking[]
}

function instant(value: string | undefined, field: string, fallback = nowIso()): string {
  if (value === undefined) return fallback
  const ms = Date.parse(value)
  if (!Number.isFinite(ms)) throw new InvalidInput(`${field} must be a date and time.`, { fields: { [field]: 'Not a date and time.' } })
  return new Date(ms).toISOString()
}

function assertReturnAfter(start: string, expectedBackAt: string): void {
  if (expectedBackAt <= start || expectedBackAt <= nowIso()) {
    throw new InvalidInput('The expected return must be later than the start and than now.', { fields: { expectedBackAt: 'Must be later than the start and than now.' } })
  }
}

async function getOutage(db: Knex, id: number): Promise<OutagePeriod> {
  const row = await db('cutter_outages').where({ id }).first()
  if (!row) throw new NotFound('No such out-of-service period.')
  return toOutagePeriod(row)
}

/**
 * Calls off every job booking on the cutter in the period whose cut has not started: the booking is cancelled
 * (pointing at the outage), its job goes back to "approved", and the member's mail — with the next free times —
 * is written in the same transaction. A cancellation already under way is left to finish.
 */
async function callOffBookings(trx: Knex.Transaction, outage: OutagePeriod, cutter: Cutter): Promise<CalledOffRow[]> {
  const settings = await workshopSettings(trx)
  const bookings: BookingWithPayment[] = await liveBookings(
    trx('bookings').where({ cutter_id: cutter.id, kind: 'job' }).where('starts_at', '<', outage.end).where('ends_at', '>', outage.start),
  ).orderBy('starts_at')
  const jobs = await trx('jobs as j')
    .join('users as u', 'u.id', 'j.member_id')
    .whereIn('j.id', bookings.map((b) => b.job_id!))
    .select('j.id', 'j.state', 'j.title', 'u.name', 'u.email')
  const now = nowIso()
  const calledOff: CalledOffRow[] = []
  for (const booking of bookings) {
    const job = jobs.find((j) => j.id === booking.job_id)
    if (job?.state !== 'booked' || cancellingNow(booking)) continue
    await trx('bookings')
      .where({ id: booking.id })
      .update({ status: 'cancelled', cancelled_at: now, cancel_reason: `Cutter out of service: ${outage.reason}`, outage_id: outage.id, ical_sequence: booking.ical_sequence + 1, updated_at: now })
    await transitionJob(trx, job.id, 'unbook', 'system', { comment: `Booking called off: ${cutter.name} is out of service (${outage.reason})` })
    calledOff.push({ booking, title: job.title, memberName: job.name })
  }
  // Offers are worked out once every called-off slot is free again and the period is refused.
  for (const { booking, title } of calledOff) {
    const job = jobs.find((j) => j.id === booking.job_id)!
    const offers = await suggestSlots(trx, cutter.id, minutesBetween(booking.starts_at, booking.ends_at))
    await sendOutageMail(
      trx,
      {
        bookingId: booking.id,
        jobId: job.id,
        jobTitle: title,
        member: { name: job.name, email: job.email },
        booking: { start: booking.starts_at, end: booking.ends_at },
        heldMinor: booking.payment_intent_id ? booking.authorised_minor : null,
        currency: booking.currency,
        offers,
      },
      outage,
      { cutterName: cutter.name, zone: settings.timeZone, workshopName: settings.workshopName },
    )
  }
  return calledOff
}

/** Gives back the card holds of the called-off bookings, through the same payment step as a free cancellation. */
async function releaseHolds(db: Knex, calledOff: CalledOffRow[]): Promise<CalledOffBooking[]> {
  const result: CalledOffBooking[] = []
  for (const { booking, title, memberName } of calledOff) {
    let holdReleased = true
    try {
      await settleCancellation(db, booking.id, 0)
    } catch (error) {
      console.error(`[outage] hold of booking ${booking.id} not released:`, (error as Error).message)
      holdReleased = false
    }
    result.push({ bookingId: booking.id, jobId: booking.job_id!, jobTitle: title, memberName, start: booking.starts_at, holdReleased })
  }
  return result
}

/** Staff mark a cutter out of service; its members are told at once, their holds released, and the period refused. */
export async function markCutterDown(db: Knex, staff: SessionUser, input: OutageCreateInput): Promise<OutageResult> {
  const cutter = await getCutter(db, input.cutterId)
  const start = instant(input.start, 'start')
  const expectedBackAt = instant(input.expectedBackAt, 'expectedBackAt')
  assertReturnAfter(start, expectedBackAt)
  const { outage, calledOff } = await inBookingTransaction(db, cutter.id, async (trx) => {
    const id = await insertedId(trx('cutter_outages').insert({ cutter_id: cutter.id, reason: input.reason, starts_at: start, expected_back_at: expectedBackAt, created_by: staff.id }))
    const outage = await getOutage(trx, id)
    return { outage, calledOff: await callOffBookings(trx, outage, cutter) }
  })
  return { outage, calledOff: await releaseHolds(db, calledOff) }
}

/** A new reason or expected return; bookings a longer period now covers are called off as when marking down. */
export async function changeOutage(db: Knex, _staff: SessionUser, id: number, change: OutageChangeInput): Promise<OutageResult> {
  const before = await getOutage(db, id)
  if (before.endedAt) throw new InvalidInput('This cutter is already back in service; mark it out of service again instead.')
  const expectedBackAt = instant(change.expectedBackAt, 'expectedBackAt', before.expectedBackAt)
  assertReturnAfter(before.start, expectedBackAt)
  const cutter = await getCutter(db, before.cutterId)
  const { outage, calledOff } = await inBookingTransaction(db, cutter.id, async (trx) => {
    await trx('cutter_outages').where({ id }).update({ reason: change.reason ?? before.reason, expected_back_at: expectedBackAt, updated_at: nowIso() })
    const outage = await getOutage(trx, id)
    return { outage, calledOff: await callOffBookings(trx, outage, cutter) }
  })
  return { outage, calledOff: await releaseHolds(db, calledOff) }
}

/** The cutter is back: the period ends now (or never starts, if it lay ahead), and the time can be booked again. */
export async function endOutage(db: Knex, staff: SessionUser, id: number): Promise<OutagePeriod> {
  const outage = await getOutage(db, id)
  if (outage.endedAt) return outage
  const now = nowIso()
  await db('cutter_outages').where({ id }).update({ ended_at: now < outage.start ? outage.start : now, ended_by: staff.id, updated_at: now })
  return getOutage(db, id)
}

export interface OutageView extends OutagePeriod {
  cutterName: string
  calledOffCount: number
}

/** Periods not over yet (under way or ahead), with their cutter and how many bookings they called off. */
export async function openOutages(db: Knex, now = nowIso()): Promise<OutageView[]> {
  const farFuture = '9999-12-31T00:00:00.000Z'
  const outages = await outagesOverlapping(db, { fromIso: now, toIso: farFuture })
  const cutters = await db('cutters').whereIn('id', outages.map((o) => o.cutterId)).select('id', 'name')
  const counts = await db('bookings').whereIn('outage_id', outages.map((o) => o.id)).groupBy('outage_id').select('outage_id', db.raw('count(*) as n'))
  return outages.map((o) => ({ ...o, cutterName: cutters.find((c) => c.id === o.cutterId)?.name ?? '', calledOffCount: Number(counts.find((c) => c.outage_id === o.id)?.n ?? 0) }))
}

export interface CalledOffForMember {
  bookingId: number
  jobId: number
  jobTitle: string
  cutterName: string
  start: string
  reason: string
  backAbout: string
}

/** The member's bookings an outage called off whose jobs are not booked again yet: the overview offers new times. */
export async function calledOffFor(db: Knex, memberId: number): Promise<CalledOffForMember[]> {
  const rows = await db('bookings as b')
    .join('cutter_outages as o', 'o.id', 'b.outage_id')
    .join('jobs as j', 'j.id', 'b.job_id')
    .join('cutters as c', 'c.id', 'b.cutter_id')
    .where({ 'b.member_id': memberId, 'j.state': 'approved' })
    .orderBy('b.starts_at')
    .select('b.id', 'b.job_id', 'b.starts_at', 'j.title', 'c.name as cutter_name', 'o.reason', db.raw('coalesce(o.ended_at, o.expected_back_at) as back_about'))
  // A job called off twice (booked again, then caught by another period) is offered once, for its latest booking.
  const latestPerJob = new Map(rows.map((r) => [r.job_id, r]))
  return [...latestPerJob.values()].map((r) => ({
    bookingId: r.id,
    jobId: r.job_id,
    jobTitle: r.title,
    cutterName: r.cutter_name,
    start: r.starts_at,
    reason: r.reason,
    backAbout: r.back_about,
  }))
}
