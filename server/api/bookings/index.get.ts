import { bookingRangeQuerySchema } from '#shared/schemas/bookings'
import { listBookings } from '../../services/bookings'

// Bookings in a range; other members' bookings come back as "busy" only.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const q = readQueryAs(event, bookingRangeQuerySchema)
  return listBookings(useDb(), user, { cutterId: q.cutter, from: new Date(q.from).toISOString(), to: new Date(q.to).toISOString(), mine: q.mine === 'true' })
})
