import { idParamSchema } from '#shared/schemas/auth'
import { bookingCancelSchema } from '#shared/schemas/bookings'
import { claimCancellation, commitCancellation, dropCancellationClaim, planCancellation } from '../../../services/bookings'
import { settleCancellation } from '../../../services/payments'

// The booking is claimed first (starting the cut is refused from then on), the payment settled next (release, or
// the late fee), and only then is the booking cancelled; a payment-service failure drops the claim and leaves the
// booking as it was, so the member can try again.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readParamsAs(event, idParamSchema)
  const { reason } = await readBodyAs(event, bookingCancelSchema)
  const plan = await planCancellation(useDb(), user, id, reason)
  await claimCancellation(useDb(), plan)
  const { feeMinor } = await settleCancellation(useDb(), id, plan.terms.feePercent).catch(async (error) => {
    await dropCancellationClaim(useDb(), id)
    throw error
  })
  const booking = await commitCancellation(useDb(), plan)
  return { booking, terms: plan.terms, cancelledByStaff: plan.cancelledByStaff, feeMinor }
})
