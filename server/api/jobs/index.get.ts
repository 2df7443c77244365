import { jobListQuerySchema } from '#shared/schemas/jobs'
import { listJobs } from '../../services/jobs'

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  return listJobs(useDb(), user, readQueryAs(event, jobListQuerySchema))
})
