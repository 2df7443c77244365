import { randomUUID } from 'node:crypto'
import type { Knex } from 'knex'
import { isStaff, type SessionUser } from '#shared/roles'
import type { WorkshopSettings } from '#shared/schemas/settings'
import { Conflict, Forbidden, InvalidInput, NotFound } from '../utils/errors'
import { nowIso } from '../utils/rows'
import { isOverlapRefusal } from '../utils/database-errors'
import { getCutter, type Cutter } from './catalog/cutters'
import { listClosures, listOpeningHours } from './catalog/opening-hours'
import { hasValidSignOff } from './catalog/sign-offs'
import { outageLabel, outagesOverlapping } from './cutter-outage-periods'
import { sendBookingMail } from './booking-mail'
import { transitionJob } from './job-states'
import { currentFiles, jobEstimate, type JobRow } from './jobs'
import { workshopSettings } from './settings'
import { addMinutes, describeLocal, inZone, localWeek, minutesBetween, onGrid, openingIntervals, type UtcInterval } from './workshop-time'
import { earliestStartTouching } from './booking-spans'
import { BOOKING_WRITE_LOCK, insertedId, isPostgres } from '../../db/dialect'

export type BookingRefusal =
  | 'in-past'
  | 'beyond-horizon'
  | 'off-grid'
  | 'cutter-inactive'
  | 'outside-hours'
  | 'closed'
  | 'out-of-service'
  | 'no-sign-off'
  | 'job-not-approved'
  | 'already-booked'
  | 'weekly-limit'
  | 'overlap'

/** A booking rule said no: 409 with the rule's code and a sentence the member understands. */
export class BookingRefused extends Conflict {
  constructor(
    readonly reason: BookingRefusal,
    message: string,
  ) {
    super(message, { reason })
  }
}

export interface BookingRow {
  id: number
  cutter_id: number
  job_id: number | null
  member_id: number | null
  kind: 'job' | 'block'
  starts_at: string
  ends_at: string
  status: 'held' | 'confirmed' | 'cancelled'
  hold_expires_at: string | null
  note: string
  ical_uid: string
  ical_sequence: number
  cancelled_at: string | null
  cancel_reason: string | null
}

/** Live bookings: not cancelled, and not a payment hold that ran out. */
export function liveBookings(query: Knex.QueryBuilder, now = nowIso()): Knex.QueryBuilder {
  return query.whereNot('status', 'cancelled').where((q) => q.whereNull('hold_expires_at').orWhere('hold_expires_at', '>', now))
}

/** The booking's length: the job's estimated machine time (with its one setup) rounded up to the cutter's grid. */
export function bookingMinutes(machineS: number, granularityMinutes: number): number {
  return Math.max(1, Math.ceil(machineS / 60 / granularityMinutes - 1e-9)) * granularityMinutes
}

export async function jobBookingMinutes(db: Knex, job: JobRow, cutter: Cutter): Promise<number> {
  const estimate = await jobEstimate(db, job, await currentFiles(db, job.id))
  return bookingMinutes(estimate.machineS, cutter.bookingGranularityMinutes)
}

interface SlotCheck {
  cutter: Cutter
  startIso: string
  endIso: string
  memberId: number | null
  excludeBookingId?: number
  settings: WorkshopSettings
  /** Staff blocks skip the member rules (sign-off, weekly limit) and may lie outside opening hours. */
  block?: boolean
}

/** Every rule of a slot except the job's own state; throws BookingRefused with the first rule that fails. */
async function assertSlotAllowed(trx: Knex, check: SlotCheck): Promise<void> {
  const { cutter, startIso, endIso, settings } = check
  const zone = settings.timeZone
  const now = nowIso()
  if (startIso <= now) throw new BookingRefused('in-past', 'That time has already passed. Pick a slot in the future.')
  if (startIso > addMinutes(now, settings.bookingHorizonDays * 24 * 60)) {
    throw new BookingRefused('beyond-horizon', `Bookings open ${settings.bookingHorizonDays} days ahead. Pick an earlier day.`)
  }
  if (!onGrid(startIso, zone, cutter.bookingGranularityMinutes) || !onGrid(endIso, zone, cutter.bookingGranularityMinutes)) {
    throw new BookingRefused('off-grid', `Bookings on ${cutter.name} start and end on the ${cutter.bookingGranularityMinutes}-minute grid.`)
  }
  if (cutter.status !== 'active') throw new BookingRefused('cutter-inactive', `${cutter.name} is not in service right now.`)
  if (!check.block) {
    const periods = await listOpeningHours(trx, cutter.id)
    const open = openingIntervals(periods, zone, startIso, endIso)
    if (!open.some((i) => i.start <= startIso && endIso <= i.end)) {
      throw new BookingRefused('outside-hours', `${cutter.name} is not open for the whole of that slot (${describeLocal(startIso, zone)}, ${minutesBetween(startIso, endIso)} min).`)
    }
  }
  const closure = (await listClosures(trx, { fromIso: startIso })).find(
    (c) => (c.cutterId === null || c.cutterId === cutter.id) && c.startsAt < endIso && c.endsAt > startIso,
  )
  if (closure) throw new BookingRefused('closed', `The ${closure.cutterId ? 'cutter' : 'workshop'} is closed then: ${closure.reason}.`)
  const [outage] = await outagesOverlapping(trx, { cutterId: cutter.id, fromIso: startIso, toIso: endIso })
  if (outage) throw new BookingRefused('out-of-service', `${cutter.name} is ${outageLabel(outage)} until about ${describeLocal(outage.end, zone)}. Pick a time after that.`)
  if (!check.block && check.memberId !== null) {
    if (!(await hasValidSignOff(trx, check.memberId, cutter.id, inZone(startIso, zone).toISODate()!))) {
      throw new BookingRefused('no-sign-off', `A valid induction sign-off for ${cutter.name} is needed to book it. Ask the staff about the next induction.`)
    }
    const week = localWeek(startIso, zone)
    const booked = await liveBookings(trx('bookings').where({ member_id: check.memberId }).where('starts_at', '<', week.end).where('ends_at', '>', week.start).where('starts_at', '>', await earliestStartTouching(trx, week.start)))
      .whereNot('id', check.excludeBookingId ?? 0)
      .select('starts_at', 'ends_at')
    const used = booked.reduce((sum: number, b: { starts_at: string; ends_at: string }) => sum + minutesBetween(b.starts_at, b.ends_at), 0)
    if (used + minutesBetween(startIso, endIso) > settings.weeklyLimitMinutes) {
      throw new BookingRefused('weekly-limit', `That would take your bookings this week to ${used + minutesBetween(startIso, endIso)} minutes; the workshop allows ${settings.weeklyLimitMinutes} per member per week.`)
    }
  }
  const clash = await liveBookings(trx('bookings').where({ cutter_id: cutter.id }).where('starts_at', '<', endIso).where('ends_at', '>', startIso).where('starts_at', '>', await earliestStartTouching(trx, startIso, cutter.id)))
    .whereNot('id', check.excludeBookingId ?? 0)
    .first('id')
  if (clash) throw new BookingRefused('overlap', 'Someone else has that time on this cutter. Pick another slot.')
}

/**
 * Runs a booking change as one write transaction, one at a time across every app server, so the rules it reads
 * (the cutter's free time, the member's week) still hold when it writes. SQLite: the first statement writes, so
 * SQLite grants its one write lock before any rule is read (the effect of BEGIN IMMEDIATE, which Knex can't issue).
 * PostgreSQL: the transaction first takes the booking advisory lock, which the overlap trigger takes too. Either
 * way the database trigger still refuses an overlapping row whatever the application does.
 */
export async function inBookingTransaction<T>(db: Knex, cutterId: number, work: (trx: Knex.Transaction) => Promise<T>): Promise<T> {
  try {
    return await db.transaction(async (trx) => {
      if (isPostgres(trx)) await trx.raw('SELECT pg_advisory_xact_lock(?)', [BOOKING_WRITE_LOCK])
      else await trx('cutters').where({ id: cutterId }).update({ updated_at: trx.ref('updated_at') })
      return work(trx)
    })
  } catch (error) {
    if (isOverlapRefusal(error)) throw new BookingRefused('overlap', 'Someone else has that time on this cutter. Pick another slot.')
    throw error
  }
}

function normaliseInstant(value: string, field = 'start'): string {
  const ms = Date.parse(value)
  if (!Number.isFinite(ms)) throw new InvalidInput(`${field} must be a date and time.`, { fields: { [field]: 'Not a date and time.' } })
  return new Date(ms).toISOString()
}

export async function bookJob(db: Knex, actor: SessionUser, input: { jobId: number; cutterId: number; start: string }): Promise<BookingRow> {
  const settings = await workshopSettings(db)
  const cutter = await getCutter(db, input.cutterId)
  const job = await db<JobRow>('jobs').where({ id: input.jobId }).first()
  if (!job || (job.member_id !== actor.id && !isStaff(actor))) throw new NotFound('No such job.')
  if (job.cutter_id !== cutter.id) throw new InvalidInput('This job was checked for another cutter; book it on that one.', { fields: { cutterId: 'Not the job’s cutter.' } })
  const startIso = normaliseInstant(input.start)
  const endIso = addMinutes(startIso, await jobBookingMinutes(db, job, cutter))
  const id = await inBookingTransaction(db, cutter.id, async (trx) => {
    const fresh = await trx<JobRow>('jobs').where({ id: job.id }).first()
    if (await liveBookings(trx('bookings').where({ job_id: job.id })).first('id')) throw new BookingRefused('already-booked', 'This job already has a booking. Move or cancel that one instead.')
    if (fresh!.state !== 'approved') throw new BookingRefused('job-not-approved', 'Only an approved job can be booked.')
    await assertSlotAllowed(trx, { cutter, startIso, endIso, memberId: job.member_id, settings })
    const bookingId = await insertedId(trx('bookings').insert({
      cutter_id: cutter.id,
      job_id: job.id,
      member_id: job.member_id,
      kind: 'job',
      starts_at: startIso,
      ends_at: endIso,
      // Held until the card payment is authorised (the webhook confirms it); released when the time to pay runs out.
      status: 'held',
      hold_expires_at: addMinutes(nowIso(), settings.paymentHoldMinutes),
      ical_uid: `${randomUUID()}@kerfbook`,
      created_by: actor.id,
    }))
    await transitionJob(trx, job.id, 'book', 'system', { comment: `Booked ${describeLocal(startIso, settings.timeZone)} on ${cutter.name}` })
    return bookingId
  })
  return getBookingRow(db, id)
}

export async function blockTime(db: Knex, staff: SessionUser, input: { cutterId: number; start: string; end: string; reason: string }): Promise<BookingRow> {
  const settings = await workshopSettings(db)
  const cutter = await getCutter(db, input.cutterId)
  const startIso = normaliseInstant(input.start)
  const endIso = normaliseInstant(input.end, 'end')
  if (endIso <= startIso) throw new InvalidInput('The end must be after the start.', { fields: { end: 'Must be after the start.' } })
  const id = await inBookingTransaction(db, cutter.id, async (trx) => {
    await assertSlotAllowed(trx, { cutter, startIso, endIso, memberId: null, settings, block: true })
    const blockId = await insertedId(trx('bookings').insert({ cutter_id: cutter.id, kind: 'block', starts_at: startIso, ends_at: endIso, status: 'confirmed', note: input.reason, ical_uid: `${randomUUID()}@kerfbook`, created_by: staff.id }))
    return blockId
  })
  return getBookingRow(db, id)
}

export async function getBookingRow(db: Knex, id: number): Promise<BookingRow> {
  const row = await db<BookingRow>('bookings').where({ id }).first()
  if (!row) throw new NotFound('No such booking.')
  return row
}

/** The booking if the viewer may see it, cancelled or not; another member's booking is "not found". */
export async function bookingVisibleTo(db: Knex, viewer: SessionUser, id: number): Promise<BookingRow> {
  const row = await db<BookingRow>('bookings').where({ id }).first()
  if (!row || (!isStaff(viewer) && row.member_id !== viewer.id)) throw new NotFound('No such booking.')
  return row
}

/** The booking if the actor may still change it. */
export async function bookingForActor(db: Knex, actor: SessionUser, id: number): Promise<BookingRow> {
  const row = await bookingVisibleTo(db, actor, id)
  if (row.status === 'cancelled') throw new Conflict('This booking was cancelled.')
  return row
}

/** Moving or cancelling is for a booking still ahead of its cut; once cutting starts the booking is the cut's record. */
async function assertNotStarted(db: Knex, booking: BookingRow): Promise<void> {
  if (!booking.job_id) return
  const job = await db('jobs').where({ id: booking.job_id }).first('state')
  if (job?.state !== 'booked') throw new Conflict('The cut has started or is done: this booking can no longer be moved or cancelled.')
}

/** Moves a booking (same rules as booking it); staff moving someone else's booking give a reason. */
export async function rescheduleBooking(
  db: Knex,
  actor: SessionUser,
  id: number,
  input: { start: string; end?: string; reason?: string },
): Promise<{ booking: BookingRow; movedByStaff: boolean }> {
  const booking = await bookingForActor(db, actor, id)
  await assertNotStarted(db, booking)
  const movedByStaff = booking.member_id !== null && booking.member_id !== actor.id
  if (movedByStaff && !input.reason?.trim()) throw new InvalidInput('Say why you move this booking; the member is told.', { fields: { reason: 'A reason is required.' } })
  if (booking.kind === 'block' && !isStaff(actor)) throw new Forbidden()
  const settings = await workshopSettings(db)
  // Inside the late-cancellation window a member's move would dodge the fee: only staff move it then.
  if (!isStaff(actor) && cancellationTerms(booking, settings).late) {
    throw new Conflict('This booking is inside the late-cancellation window, so it can no longer be moved. Ask the staff, or cancel it under the policy.')
  }
  const cutter = await getCutter(db, booking.cutter_id)
  const startIso = normaliseInstant(input.start)
  const endIso = booking.kind === 'block' && input.end ? normaliseInstant(input.end, 'end') : addMinutes(startIso, minutesBetween(booking.starts_at, booking.ends_at))
  await inBookingTransaction(db, cutter.id, async (trx) => {
    await assertSlotAllowed(trx, { cutter, startIso, endIso, memberId: booking.member_id, excludeBookingId: id, settings, block: booking.kind === 'block' })
    await trx('bookings')
      .where({ id })
      .update({
        starts_at: startIso,
        ends_at: endIso,
        ical_sequence: booking.ical_sequence + 1,
        note: input.reason?.trim() || booking.note,
        reminder_sent_at: null,
        updated_at: nowIso(),
      })
    if (booking.job_id) await trx('job_events').insert({ job_id: booking.job_id, actor_id: actor.id, from_state: 'booked', to_state: 'booked', comment: `Moved to ${describeLocal(startIso, settings.timeZone)}${input.reason ? `: ${input.reason}` : ''}` })
    const moved = await trx<BookingRow>('bookings').where({ id }).first()
    await sendBookingMail(trx, moved!, 'moved', movedByStaff ? `The staff moved it: ${moved!.note}` : '')
  })
  return { booking: await getBookingRow(db, id), movedByStaff }
}

export interface CancellationTerms {
  late: boolean
  feePercent: number
  freeUntil: string
}

export function cancellationTerms(booking: Pick<BookingRow, 'starts_at'>, settings: WorkshopSettings, now = nowIso()): CancellationTerms {
  const freeUntil = addMinutes(booking.starts_at, -settings.freeCancellationHours * 60)
  const late = now > freeUntil
  return { late, feePercent: late ? settings.lateCancellationFeePercent : 0, freeUntil }
}

export interface CancellationPlan {
  booking: BookingRow
  reason: string
  terms: CancellationTerms
  cancelledByStaff: boolean
}

/** Checks a cancellation and works out its terms; nothing changes yet (the payment is settled first). */
export async function planCancellation(db: Knex, actor: SessionUser, id: number, reason = ''): Promise<CancellationPlan> {
  const booking = await bookingForActor(db, actor, id)
  await assertNotStarted(db, booking)
  const cancelledByStaff = booking.member_id !== null && booking.member_id !== actor.id
  if (cancelledByStaff && !reason.trim()) throw new InvalidInput('Say why you cancel this booking; the member is told.', { fields: { reason: 'A reason is required.' } })
  const settings = await workshopSettings(db)
  // Staff cancelling for the workshop never charge the member a fee.
  const terms = cancelledByStaff ? { ...cancellationTerms(booking, settings), late: false, feePercent: 0 } : cancellationTerms(booking, settings)
  return { booking, reason: reason.trim(), terms, cancelledByStaff }
}

// A claim older than this was left by a server that stopped mid-cancellation (the payment calls time out well before).
const CANCELLING_CLAIM_MS = 2 * 60_000

/** A cancellation under way (its payment settling) that starting the cut must not overtake. */
export function cancellingNow(booking: { cancelling_since?: string | null }, now = Date.now()): boolean {
  return !!booking.cancelling_since && now - Date.parse(booking.cancelling_since) < CANCELLING_CLAIM_MS
}

/**
 * Claims the booking for its cancellation before any money moves: in one write transaction the job must still be
 * "booked" and no other cancellation under way. Starting the cut checks the claim in its own write transaction, so
 * SQLite orders the two: either the cut started first (this answers 409) or the start is refused.
 */
export async function claimCancellation(db: Knex, plan: CancellationPlan): Promise<void> {
  await db.transaction(async (trx) => {
    const now = nowIso()
    await trx('bookings').where({ id: plan.booking.id }).update({ updated_at: trx.ref('updated_at') })
    const fresh = await trx('bookings').where({ id: plan.booking.id }).first()
    if (fresh.status === 'cancelled') throw new Conflict('This booking was cancelled.')
    if (cancellingNow(fresh)) throw new Conflict('This booking is being cancelled already.')
    await assertNotStarted(trx, fresh)
    await trx('bookings').where({ id: plan.booking.id }).update({ cancelling_since: now })
  })
}

/** The payment could not be settled: the booking stays as it was and can be started or cancelled again. */
export async function dropCancellationClaim(db: Knex, bookingId: number): Promise<void> {
  await db('bookings').where({ id: bookingId }).update({ cancelling_since: null })
}

/** Cancels the booking once its payment is settled; the job goes back to "approved" so it can be booked again. The member's mail is written with it. */
export async function commitCancellation(db: Knex, plan: CancellationPlan): Promise<BookingRow> {
  const { booking, reason } = plan
  await db.transaction(async (trx) => {
    const now = nowIso()
    await trx('bookings').where({ id: booking.id }).update({ status: 'cancelled', cancelled_at: now, cancel_reason: reason, cancelling_since: null, ical_sequence: booking.ical_sequence + 1, updated_at: now })
    if (booking.job_id) {
      const job = await trx('jobs').where({ id: booking.job_id }).first('state')
      if (job?.state === 'booked') await transitionJob(trx, booking.job_id, 'unbook', 'system', { comment: `Booking cancelled${reason ? `: ${reason}` : ''}` })
    }
    const cancelled = await trx<BookingRow>('bookings').where({ id: booking.id }).first()
    await sendBookingMail(trx, cancelled!, 'cancelled', plan.cancelledByStaff ? `The staff cancelled it: ${reason}` : '')
  })
  return getBookingRow(db, booking.id)
}

export interface BookingView {
  id: number
  cutterId: number
  start: string
  end: string
  kind: 'job' | 'block'
  status: BookingRow['status']
  /** Only for the member's own bookings and for staff; others see "busy". */
  jobId?: number | null
  title?: string
  memberName?: string | null
  note?: string
  own: boolean
}

export async function listBookings(
  db: Knex,
  viewer: SessionUser,
  filter: { cutterId?: number; from: string; to: string; mine?: boolean },
): Promise<BookingView[]> {
  const query = liveBookings(db('bookings as b'))
    .leftJoin('jobs as j', 'j.id', 'b.job_id')
    .leftJoin('users as u', 'u.id', 'b.member_id')
    .where('b.starts_at', '<', filter.to)
    .where('b.ends_at', '>', filter.from)
    .where('b.starts_at', '>', await earliestStartTouching(db, filter.from, filter.cutterId))
    .orderBy('b.starts_at')
    .select('b.*', 'j.title as job_title', 'u.name as member_name')
  if (filter.cutterId) query.where('b.cutter_id', filter.cutterId)
  if (filter.mine) query.where('b.member_id', viewer.id)
  return (await query).map((row: BookingRow & { job_title: string | null; member_name: string | null }) => {
    const own = row.member_id === viewer.id
    const base = { id: row.id, cutterId: row.cutter_id, start: row.starts_at, end: row.ends_at, kind: row.kind, status: row.status, own }
    if (!own && !isStaff(viewer)) return base
    return { ...base, jobId: row.job_id, title: row.kind === 'block' ? `Blocked: ${row.note}` : (row.job_title ?? ''), memberName: row.member_name, note: row.note }
  })
}

/** For the calendar's shading: opening periods and closures (out-of-service periods among them) of a cutter in a range, in UTC. */
export async function cutterAvailability(db: Knex, cutterId: number, from: string, to: string) {
  const settings = await workshopSettings(db)
  const periods = await listOpeningHours(db, cutterId)
  const closures = (await listClosures(db, { fromIso: from })).filter((c) => (c.cutterId === null || c.cutterId === cutterId) && c.startsAt < to)
  const outages = await outagesOverlapping(db, { cutterId, fromIso: from, toIso: to })
  return {
    timeZone: settings.timeZone,
    open: openingIntervals(periods, settings.timeZone, from, to),
    closures: [
      ...closures.map((c) => ({ start: c.startsAt, end: c.endsAt, reason: c.reason })),
      ...outages.map((o) => ({ start: o.start, end: o.end, reason: outageLabel(o) })),
    ],
  }
}

/** The first free starts on the grid that fit `minutes`, inside opening hours and outside closures and bookings. */
export async function suggestSlots(db: Knex, cutterId: number, minutes: number, count = 3, from = nowIso()): Promise<UtcInterval[]> {
  const settings = await workshopSettings(db)
  const cutter = await getCutter(db, cutterId)
  const until = addMinutes(from, settings.bookingHorizonDays * 24 * 60)
  const { open, closures } = await cutterAvailability(db, cutterId, from, until)
  const taken = [...closures, ...(await liveBookings(db('bookings').where({ cutter_id: cutterId }).where('ends_at', '>', from).where('starts_at', '<', until).where('starts_at', '>', await earliestStartTouching(db, from, cutterId))).select('starts_at as start', 'ends_at as end'))]
  const step = cutter.bookingGranularityMinutes
  const found: UtcInterval[] = []
  for (const period of open) {
    for (let start = period.start; addMinutes(start, minutes) <= period.end && found.length < count; start = addMinutes(start, step)) {
      const end = addMinutes(start, minutes)
      if (start > from && !taken.some((t) => t.start < end && t.end > start)) found.push({ start, end })
    }
    if (found.length >= count) break
  }
  return found
}
