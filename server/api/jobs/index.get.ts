import { jobListQuerySchema } from '#shared/schemas/jobs'
import { listJobs, listJobsPage } from '../../services/jobs'

// With `limit` (and then `cursor`) the list comes in pages; without, whole, as the review queue and calendar read it.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { limit, cursor, ...filter } = readQueryAs(event, jobListQuerySchema)
  return limit ? listJobsPage(useDb(), user, filter, { limit, cursor }) : listJobs(useDb(), user, filter)
})
