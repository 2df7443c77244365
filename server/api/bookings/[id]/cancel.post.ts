import { idParamSchema } from '#shared/schemas/auth'
import { bookingCancelSchema } from '#shared/schemas/bookings'
import { sendBookingMail } from '../../../services/booking-mail'
import { cancelBooking } from '../../../services/bookings'

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readParamsAs(event, idParamSchema)
  const { reason } = await readBodyAs(event, bookingCancelSchema)
  const result = await cancelBooking(useDb(), user, id, reason)
  await sendBookingMail(useDb(), result.booking, 'cancelled', result.cancelledByStaff ? `The staff cancelled it: ${reason}` : '')
  return result
})
