import { idParamSchema } from '#shared/schemas/auth'
import { bookingCancelSchema } from '#shared/schemas/bookings'
import { sendBookingMail } from '../../../services/booking-mail'
import { cancelBooking } from '../../../services/bookings'
import { sendPaymentReceipts } from '../../../services/payment-mail'
import { settleCancellation } from '../../../services/payments'

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readParamsAs(event, idParamSchema)
  const { reason } = await readBodyAs(event, bookingCancelSchema)
  const result = await cancelBooking(useDb(), user, id, reason)
  const { feeMinor, newKinds } = await settleCancellation(useDb(), id, result.terms.feePercent)
  await sendBookingMail(useDb(), result.booking, 'cancelled', result.cancelledByStaff ? `The staff cancelled it: ${reason}` : '')
  await sendPaymentReceipts(useDb(), { bookingId: id, memberId: result.booking.member_id, kinds: newKinds })
  return { ...result, feeMinor }
})
