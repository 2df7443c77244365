import { idParamSchema } from '#shared/schemas/auth'
import { cancellationTerms, getBookingRow } from '../../../services/bookings'
import { workshopSettings } from '../../../services/settings'
import { NotFound } from '../../../utils/errors'

// What cancelling now would cost, shown before the member confirms.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readParamsAs(event, idParamSchema)
  const booking = await getBookingRow(useDb(), id)
  if (booking.member_id !== user.id && user.role === 'member') throw new NotFound('No such booking.')
  return cancellationTerms(booking, await workshopSettings(useDb()))
})
