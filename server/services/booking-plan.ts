import type { Knex } from 'knex'
import type { SessionUser } from '#shared/roles'
import { getCutter } from './catalog/cutters'
import { hasValidSignOff } from './catalog/sign-offs'
import { cancellationTerms, jobBookingMinutes, suggestSlots } from './bookings'
import { jobForViewer, jobEstimate, currentFiles } from './jobs'
import { percentOf } from './money'
import { workshopSettings } from './settings'

/**
 * What the calendar needs to book one job: its cutter, how long the booking is, the next free slots
 * (each marked when it already lies inside the late-cancellation window), what a late cancellation
 * would cost, and whether the member holds the cutter's sign-off.
 */
export async function bookingPlan(db: Knex, viewer: SessionUser, jobId: number) {
  const job = await jobForViewer(db, viewer, jobId)
  const cutter = await getCutter(db, job.cutter_id)
  const settings = await workshopSettings(db)
  const [minutes, estimate, signedOff] = await Promise.all([
    jobBookingMinutes(db, job, cutter),
    currentFiles(db, job.id).then((files) => jobEstimate(db, job, files)),
    hasValidSignOff(db, job.member_id, cutter.id),
  ])
  const slots = await suggestSlots(db, cutter.id, minutes)
  return {
    jobId: job.id,
    cutterId: cutter.id,
    cutterName: cutter.name,
    minutes,
    slots: slots.map((slot) => ({ ...slot, late: cancellationTerms({ starts_at: slot.start }, settings).late })),
    estimateMinor: estimate.totalPriceMinor,
    currency: estimate.currency,
    cancellation: {
      freeHours: settings.freeCancellationHours,
      feePercent: settings.lateCancellationFeePercent,
      // The fee is the policy's share of the estimate (settleCancellation charges the same).
      lateFeeMinor: percentOf(estimate.totalPriceMinor, settings.lateCancellationFeePercent),
    },
    memberSignedOff: signedOff,
  }
}

export type BookingPlan = Awaited<ReturnType<typeof bookingPlan>>
