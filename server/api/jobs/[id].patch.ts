import { idParamSchema } from '#shared/schemas/auth'
import { jobUpdateSchema } from '#shared/schemas/jobs'
import { jobDetail, jobForViewer, updateJob } from '../../services/jobs'

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readParamsAs(event, idParamSchema)
  // Whose job it is comes first: a stranger gets 404 before anything is read or validated.
  await jobForViewer(useDb(), user, id)
  await updateJob(useDb(), user, id, await readBodyAs(event, jobUpdateSchema))
  return jobDetail(useDb(), user, id)
})
