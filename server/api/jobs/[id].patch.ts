import { idParamSchema } from '#shared/schemas/auth'
import { jobUpdateSchema } from '#shared/schemas/jobs'
import { jobDetail, updateJob } from '../../services/jobs'

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readParamsAs(event, idParamSchema)
  await updateJob(useDb(), user, id, await readBodyAs(event, jobUpdateSchema))
  return jobDetail(useDb(), user, id)
})
