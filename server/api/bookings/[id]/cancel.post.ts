import { idParamSchema } from '#shared/schemas/auth'
import { bookingCancelSchema } from '#shared/schemas/bookings'
import { sendBookingMail } from '../../../services/booking-mail'
import { commitCancellation, planCancellation } from '../../../services/bookings'
import { sendPaymentReceipts } from '../../../services/payment-mail'
import { settleCancellation } from '../../../services/payments'

// The payment is settled first (release, or the late fee); only then is the booking cancelled, so a
// payment-service failure leaves the booking as it was and the member can try again.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readParamsAs(event, idParamSchema)
  const { reason } = await readBodyAs(event, bookingCancelSchema)
  const plan = await planCancellation(useDb(), user, id, reason)
  const { feeMinor, newKinds } = await settleCancellation(useDb(), id, plan.terms.feePercent)
  const booking = await commitCancellation(useDb(), plan)
  await sendBookingMail(useDb(), booking, 'cancelled', plan.cancelledByStaff ? `The staff cancelled it: ${reason}` : '')
  await sendPaymentReceipts(useDb(), { bookingId: id, memberId: booking.member_id, kinds: newKinds })
  return { booking, terms: plan.terms, cancelledByStaff: plan.cancelledByStaff, feeMinor }
})
