import { randomInt } from 'node:crypto'
import type { Knex } from 'knex'
import type { SessionUser } from '#shared/roles'
import { Conflict, InvalidInput, NotFound } from '../utils/errors'
import { nowIso } from '../utils/rows'
import { useStripe } from '../utils/stripe'
import { cancellingNow, liveBookings, type BookingRow } from './bookings'
import { balancesOwed } from './balance'
import { transitionJob, type TransitionRecord } from './job-states'
import { currentFiles, jobEstimate, jobForViewer, type JobRow } from './jobs'
import { formatMinor } from './money'
import { sendPickupMail } from './pickup-mail'
import { quoteCut, settleCut, type CutQuote, type Settlement } from './payments'

export type TimerKind = 'start' | 'pause' | 'resume' | 'finish'
export type ProblemKind = 'failed-cut' | 're-cut' | 'material-defect' | 'other'

/** The job's live booking; cutting and payment hang off it. */
export async function bookingOfJob(db: Knex, jobId: number): Promise<BookingRow> {
  const booking = await liveBookings(db('bookings').where({ job_id: jobId })).first()
  if (!booking) throw new Conflict('This job has no booking.')
  return booking
}

/** Minutes the timer ran: from each start or resume to the next pause or finish (or now, while running). */
export function timerMinutes(events: { kind: TimerKind; at: string }[], now = nowIso()): { minutes: number; running: boolean } {
  let runningSince: string | null = null
  let ms = 0
  for (const event of events) {
    if (event.kind === 'start' || event.kind === 'resume') runningSince ??= event.at
    else if (runningSince) {
      ms += Date.parse(event.at) - Date.parse(runningSince)
      runningSince = null
    }
  }
  if (runningSince) ms += Date.parse(now) - Date.parse(runningSince)
  return { minutes: ms / 60_000, running: runningSince !== null }
}

async function timerEvents(db: Knex, jobId: number) {
  return db('cut_timer_events').where({ job_id: jobId }).orderBy('id').select('kind', 'at') as Promise<{ kind: TimerKind; at: string }[]>
}

export async function startCut(db: Knex, staff: SessionUser, jobId: number): Promise<TransitionRecord> {
  await jobForViewer(db, staff, jobId)
  const { id: bookingId } = await bookingOfJob(db, jobId)
  return db.transaction(async (trx) => {
    // The first statement writes, so the booking is read under the write lock a cancellation's claim also takes.
    await trx('bookings').where({ id: bookingId }).update({ updated_at: trx.ref('updated_at') })
    const booking = await trx('bookings').where({ id: bookingId }).first()
    if (booking.status === 'cancelled') throw new Conflict('This booking was cancelled.')
    if (cancellingNow(booking)) throw new Conflict('The member is cancelling this booking right now; it can no longer be started.')
    if (booking.status !== 'confirmed') throw new Conflict('The booking is not paid yet; the member has to finish the checkout first.')
    const record = await transitionJob(trx, jobId, 'startCutting', staff, { comment: 'Cutting started' })
    await trx('cut_timer_events').insert({ job_id: jobId, kind: 'start', at: nowIso(), actor_id: staff.id })
    return record
  })
}

/** Pause or resume the running cut; the timer keeps server time, so a closed browser loses nothing. */
export async function pauseOrResume(db: Knex, staff: SessionUser, jobId: number, kind: 'pause' | 'resume'): Promise<{ minutes: number; running: boolean }> {
  const job = await jobForViewer(db, staff, jobId)
  if (job.state !== 'cutting') throw new Conflict('Only a job on the machine can be paused or resumed.')
  const timer = timerMinutes(await timerEvents(db, jobId))
  if (kind === 'pause' && !timer.running) throw new Conflict('The timer is already paused.')
  if (kind === 'resume' && timer.running) throw new Conflict('The timer is already running.')
  await db('cut_timer_events').insert({ job_id: jobId, kind, at: nowIso(), actor_id: staff.id })
  return timerMinutes(await timerEvents(db, jobId))
}

export async function reportProblem(db: Knex, staff: SessionUser, jobId: number, kind: ProblemKind, note: string): Promise<void> {
  await jobForViewer(db, staff, jobId)
  await db.transaction(async (trx) => {
    await trx('cut_problems').insert({ job_id: jobId, kind, note, actor_id: staff.id })
    const job = await trx('jobs').where({ id: jobId }).first('state')
    await trx('job_events').insert({ job_id: jobId, actor_id: staff.id, from_state: job.state, to_state: job.state, comment: `Problem (${kind}): ${note}` })
  })
}

/**
 * Finishes the cut with the minutes actually used — typed by staff, or the timer's own — records
 * what the estimate said at that moment (for reports and calibration) and captures the payment.
 */
/** The cutting minutes finishing would charge: typed by staff, or the timer's own, to 1/100 minute. */
function minutesToCharge(typedMinutes: number | undefined, timer: { minutes: number }): number {
  const actualMinutes = Math.round((typedMinutes ?? timer.minutes) * 100) / 100
  if (!(actualMinutes > 0)) throw new InvalidInput('Enter the minutes actually cut: the timer has not run.', { fields: { actualMinutes: 'Required when the timer was not used.' } })
  return actualMinutes
}

/** For the finish form: the timer, the estimate and what finishing with these minutes would charge. Nothing changes. */
export async function finishQuote(db: Knex, staff: SessionUser, jobId: number, typedMinutes: number | undefined): Promise<CutQuote & { timerMinutes: number }> {
  const job = await jobForViewer(db, staff, jobId)
  if (job.state !== 'cutting') throw new Conflict('Only a job on the machine can be finished.')
  const booking = await bookingOfJob(db, jobId)
  const timer = timerMinutes(await timerEvents(db, jobId))
  return { ...(await quoteCut(db, booking.id, minutesToCharge(typedMinutes, timer))), timerMinutes: Math.round(timer.minutes * 100) / 100 }
}

export async function finishCut(db: Knex, staff: SessionUser, jobId: number, typedMinutes: number | undefined, note = '', confirmedChargeMinor?: number): Promise<{ settlement: Settlement; record: TransitionRecord }> {
  const job = await jobForViewer(db, staff, jobId)
  const booking = await bookingOfJob(db, jobId)
  const timer = timerMinutes(await timerEvents(db, jobId))
  const actualMinutes = minutesToCharge(typedMinutes, timer)
  if (job.state !== 'cutting') throw new Conflict('Only a job on the machine can be finished.')
  const comment = `Cut in ${actualMinutes} min${typedMinutes === undefined ? ' (timer)' : ''}${note ? `: ${note}` : ''}`
  // The finish is noted before the card is captured, so a crash between the capture and the commit can be completed.
  await db('jobs').where({ id: jobId, state: 'cutting' }).update({ finishing_minutes: actualMinutes, finishing_comment: comment, finishing_by: staff.id, finishing_since: nowIso() })
  // Charge first: if the payment service fails, the job stays on the machine and finishing can be tried again.
  const settlement = await settleCut(db, booking.id, actualMinutes, confirmedChargeMinor)
  return { settlement, record: await commitFinish(db, job, staff, actualMinutes, comment) }
}

/** The finish's own write, after the payment: the move, the timer's end, and what the estimate said then. */
async function commitFinish(db: Knex, job: JobRow, staff: SessionUser, actualMinutes: number, comment: string): Promise<TransitionRecord> {
  const jobId = job.id
  const estimate = await jobEstimate(db, job, await currentFiles(db, jobId))
  const now = nowIso()
  return db.transaction(async (trx) => {
    const moved = await transitionJob(trx, jobId, 'finishCutting', staff, { comment })
    await trx('cut_timer_events').insert({ job_id: jobId, kind: 'finish', at: now, actor_id: staff.id })
    await trx('jobs').where({ id: jobId }).update({
      finishing_minutes: null,
      finishing_comment: null,
      finishing_by: null,
      finishing_since: null,
      actual_minutes: actualMinutes,
      estimated_minutes: estimate.machineS / 60,
      estimated_cut_s: estimate.components.cutS,
      estimated_pierce_s: estimate.components.pierceS,
      estimated_travel_s: estimate.components.travelS,
      estimated_setup_s: estimate.components.setupS,
      sheets_used: estimate.sheetCount,
      cut_finished_at: now,
      updated_at: now,
    })
    return moved
  })
}

// A finish noted this long ago and not committed was cut off (the capture call itself times out well before).
const FINISH_STALE_MS = 2 * 60_000

/**
 * The reconcile duty: a finish noted before its capture but never committed (the server stopped in between) is
 * completed from the PaymentIntent's real state — captured: settled and committed with the noted minutes; still
 * only held: the note is dropped and staff finish again. Stripe's webhook retries are not the only way back.
 */
export async function reconcileUnfinishedCuts(db: Knex, olderThanMs = FINISH_STALE_MS): Promise<{ finished: Settlement[]; reopened: number }> {
  const before = new Date(Date.now() - olderThanMs).toISOString()
  const stuck = await db<JobRow & { finishing_minutes: number; finishing_comment: string; finishing_by: number }>('jobs').where({ state: 'cutting' }).whereNotNull('finishing_since').where('finishing_since', '<=', before)
  const finished: Settlement[] = []
  let reopened = 0
  for (const job of stuck) {
    const booking = (await bookingOfJob(db, job.id)) as BookingRow & { payment_intent_id: string | null }
    const intent = booking.payment_intent_id ? await useStripe().paymentIntents.retrieve(booking.payment_intent_id) : null
    if (intent?.status !== 'succeeded') {
      await db('jobs').where({ id: job.id }).update({ finishing_minutes: null, finishing_comment: null, finishing_by: null, finishing_since: null })
      reopened++
      continue
    }
    const staff = await db('users').where({ id: job.finishing_by }).first('id', 'email', 'name', 'role')
    const settlement = await settleCut(db, booking.id, job.finishing_minutes)
    await commitFinish(db, job, staff as SessionUser, job.finishing_minutes, `${job.finishing_comment} (completed by the payment check)`)
    finished.push(settlement)
  }
  return { finished, reopened }
}

// Codes are read aloud and typed: no 0/O or 1/I/L.
const CODE_ALPHABET = 'ABCDEFGHJKMNPQRSTUVWXYZ23456789'

function newPickupCode(): string {
  return Array.from({ length: 6 }, () => CODE_ALPHABET[randomInt(CODE_ALPHABET.length)]).join('')
}

export async function markReady(db: Knex, staff: SessionUser, jobId: number, location: string): Promise<{ record: TransitionRecord; code: string }> {
  await jobForViewer(db, staff, jobId)
  return db.transaction(async (trx) => {
    let code = newPickupCode()
    while (await trx('jobs').where({ pickup_code: code, state: 'ready' }).first('id')) code = newPickupCode()
    const record = await transitionJob(trx, jobId, 'markReady', staff, { comment: `On the pickup shelf: ${location}` })
    await trx('jobs').where({ id: jobId }).update({ pickup_code: code, pickup_location: location, ready_at: nowIso() })
    await sendPickupMail(trx, jobId, 'ready')
    return { record, code }
  })
}

/**
 * Hands the parts over for a pickup code; each code works once, for its one job. While the member owes a balance
 * the hand-over waits for staff to confirm it (409 with reason "balance-owed" and the amount).
 */
export async function collectWithCode(
  db: Knex,
  staff: SessionUser,
  code: string,
  handOverWithBalanceOwed = false,
): Promise<{ record: TransitionRecord; job: JobRow }> {
  const normalised = code.trim().toUpperCase().replace(/[\s-]/g, '')
  return db.transaction(async (trx) => {
    const job = await trx<JobRow>('jobs').where({ pickup_code: normalised }).orderBy('id', 'desc').first()
    if (!job) throw new NotFound('No parts are waiting under that code. Check the letters with the member.')
    if (job.state !== 'ready') throw new Conflict('This code was already used: the parts were collected.')
    const [owed] = await balancesOwed(trx, { jobId: job.id })
    if (owed && !handOverWithBalanceOwed) {
      throw new Conflict(`The member still owes ${formatMinor(owed.balanceMinor, owed.currency)} for "${job.title}". Ask them to pay it under "My payments", or confirm the hand-over anyway.`, { reason: 'balance-owed', ...owed })
    }
    const record = await transitionJob(trx, job.id, 'markCollected', staff, { comment: `Collected with the pickup code${owed ? `; handed over with ${formatMinor(owed.balanceMinor, owed.currency)} still owed` : ''}` })
    await trx('jobs').where({ id: job.id }).update({ collected_at: nowIso() })
    return { record, job }
  })
}

/** Jobs ready for more than `days` whose owner has not been reminded yet. */
export async function uncollectedDue(db: Knex, days: number, now = new Date()): Promise<number[]> {
  const before = new Date(now.getTime() - days * 86_400_000).toISOString()
  return (await db('jobs').where({ state: 'ready' }).whereNull('pickup_reminded_at').where('ready_at', '<', before).orderBy('id').select('id')).map((r) => r.id as number)
}

/** Claims a job's pickup reminder; false when another run claimed it first. */
export async function claimPickupReminder(db: Knex, jobId: number): Promise<boolean> {
  return (await db('jobs').where({ id: jobId }).whereNull('pickup_reminded_at').update({ pickup_reminded_at: nowIso() })) === 1
}
