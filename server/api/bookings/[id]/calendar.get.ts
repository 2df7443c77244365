import { idParamSchema } from '#shared/schemas/auth'
import { bookingIcs } from '../../../services/booking-calendar'
import { bookingVisibleTo } from '../../../services/bookings'
import { workshopSettings } from '../../../services/settings'

// The booking as an .ics file for the member's calendar (a cancelled one as its cancellation).
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readParamsAs(event, idParamSchema)
  await bookingVisibleTo(useDb(), user, id)
  setResponseHeader(event, 'content-type', 'text/calendar; charset=utf-8')
  setResponseHeader(event, 'content-disposition', `attachment; filename="kerfbook-booking-${id}.ics"`)
  return bookingIcs(useDb(), id, (await workshopSettings(useDb())).workshopName)
})
