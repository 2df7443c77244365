import { idParamSchema } from '#shared/schemas/auth'
import { pageQuerySchema } from '#shared/schemas/paging'
import { jobEventsPage } from '../../../services/job-events'

// A job's history, oldest first, in pages (50 unless `limit` says otherwise).
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readParamsAs(event, idParamSchema)
  const { limit, cursor } = readQueryAs(event, pageQuerySchema)
  return jobEventsPage(useDb(), user, id, { limit: limit ?? 50, cursor })
})
