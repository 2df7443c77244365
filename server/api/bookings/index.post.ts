import { bookingCreateSchema } from '#shared/schemas/bookings'
import { sendBookingMail } from '../../services/booking-mail'
import { bookJob } from '../../services/bookings'
import { startCheckout } from '../../services/payments'

// Holds the slot, then opens the card checkout; the booking is confirmed when Stripe reports the authorisation.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const booking = await bookJob(useDb(), user, await readBodyAs(event, bookingCreateSchema))
  const checkout = await startCheckout(useDb(), booking.id)
  await sendBookingMail(useDb(), booking, 'booked', `Pay within the hold time to keep the slot: ${checkout.url}`)
  setResponseStatus(event, 201)
  return { ...booking, checkoutUrl: checkout.url, authorisedMinor: checkout.authorisedMinor, estimateMinor: checkout.estimateMinor }
})
