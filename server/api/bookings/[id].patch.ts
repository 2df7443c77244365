import { idParamSchema } from '#shared/schemas/auth'
import { bookingMoveSchema } from '#shared/schemas/bookings'
import { bookingForActor, rescheduleBooking } from '../../services/bookings'

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readParamsAs(event, idParamSchema)
  // Whose booking it is comes first, so a stranger learns nothing from validation messages.
  await bookingForActor(useDb(), user, id)
  const { booking } = await rescheduleBooking(useDb(), user, id, await readBodyAs(event, bookingMoveSchema))
  return booking
})
