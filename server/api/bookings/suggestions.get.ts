import { suggestionQuerySchema } from '#shared/schemas/bookings'
import { bookingPlan } from '../../services/booking-plan'

// How long the job's booking is, the next free slots that fit it, and what cancelling them would cost.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { jobId } = readQueryAs(event, suggestionQuerySchema)
  return bookingPlan(useDb(), user, jobId)
})
