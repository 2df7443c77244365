import { idParamSchema } from '#shared/schemas/auth'
import { bookingIcs } from '../../../services/booking-calendar'
import { getBookingRow } from '../../../services/bookings'
import { workshopSettings } from '../../../services/settings'
import { NotFound } from '../../../utils/errors'

// The booking as an .ics file for the member's calendar.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readParamsAs(event, idParamSchema)
  const booking = await getBookingRow(useDb(), id)
  if (booking.member_id !== user.id && user.role === 'member') throw new NotFound('No such booking.')
  setResponseHeader(event, 'content-type', 'text/calendar; charset=utf-8')
  setResponseHeader(event, 'content-disposition', `attachment; filename="kerfbook-booking-${id}.ics"`)
  return bookingIcs(useDb(), id, (await workshopSettings(useDb())).workshopName)
})
