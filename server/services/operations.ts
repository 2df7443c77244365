import type { Knex } from 'knex'
import type { SessionUser } from '#shared/roles'
import { Conflict } from '../utils/errors'
import { liveBookings, type BookingRow } from './bookings'
import { transitionJob } from './job-states'
import { jobForViewer } from './jobs'
import { settleCut, type Settlement } from './payments'

/** The job's live booking; cutting and payment hang off it. */
export async function bookingOfJob(db: Knex, jobId: number): Promise<BookingRow> {
  const booking = await liveBookings(db('bookings').where({ job_id: jobId })).first()
  if (!booking) throw new Conflict('This job has no booking.')
  return booking
}

export async function startCut(db: Knex, staff: SessionUser, jobId: number): Promise<void> {
  await jobForViewer(db, staff, jobId)
  const booking = await bookingOfJob(db, jobId)
  if (booking.status !== 'confirmed') throw new Conflict('The booking is not paid yet; the member has to finish the checkout first.')
  await db.transaction((trx) => transitionJob(trx, jobId, 'startCutting', staff, { comment: 'Cutting started' }))
}

/** Records the minutes actually cut and charges them (capture of the card hold). */
export async function finishCut(db: Knex, staff: SessionUser, jobId: number, actualMinutes: number, note = ''): Promise<Settlement> {
  await jobForViewer(db, staff, jobId)
  const booking = await bookingOfJob(db, jobId)
  await db.transaction((trx) => transitionJob(trx, jobId, 'finishCutting', staff, { comment: `Cut in ${actualMinutes} min${note ? `: ${note}` : ''}` }))
  await db('jobs').where({ id: jobId }).update({ actual_minutes: actualMinutes })
  return settleCut(db, booking.id, actualMinutes)
}
