import { jobCreateSchema } from '#shared/schemas/jobs'
import { createJob, jobDetail } from '../../services/jobs'

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const input = await readBodyAs(event, jobCreateSchema)
  const id = await createJob(useDb(), user, input)
  setResponseStatus(event, 201)
  return jobDetail(useDb(), user, id)
})
