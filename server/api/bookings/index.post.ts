import { bookingCreateSchema } from '#shared/schemas/bookings'
import { sendBookingMail } from '../../services/booking-mail'
import { bookJob } from '../../services/bookings'

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const booking = await bookJob(useDb(), user, await readBodyAs(event, bookingCreateSchema))
  await sendBookingMail(useDb(), booking, 'booked')
  setResponseStatus(event, 201)
  return booking
})
