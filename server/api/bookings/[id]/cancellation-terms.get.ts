import { idParamSchema } from '#shared/schemas/auth'
import { bookingVisibleTo, cancellationTerms } from '../../../services/bookings'
import { workshopSettings } from '../../../services/settings'

// What cancelling now would cost, shown before the member confirms.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readParamsAs(event, idParamSchema)
  const booking = await bookingVisibleTo(useDb(), user, id)
  return cancellationTerms(booking, await workshopSettings(useDb()))
})
