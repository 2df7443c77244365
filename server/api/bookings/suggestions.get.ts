import { suggestionQuerySchema } from '#shared/schemas/bookings'
import { getCutter } from '../../services/catalog/cutters'
import { jobBookingMinutes, suggestSlots } from '../../services/bookings'
import { jobForViewer } from '../../services/jobs'

// How long the job's booking is and the next free slots that fit it.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { jobId } = readQueryAs(event, suggestionQuerySchema)
  const job = await jobForViewer(useDb(), user, jobId)
  const cutter = await getCutter(useDb(), job.cutter_id)
  const minutes = await jobBookingMinutes(useDb(), job, cutter)
  return { cutterId: cutter.id, minutes, slots: await suggestSlots(useDb(), cutter.id, minutes) }
})
