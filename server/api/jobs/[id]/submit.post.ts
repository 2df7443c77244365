import { idParamSchema } from '#shared/schemas/auth'
import { submitJobSchema } from '#shared/schemas/jobs'
import { submitJob } from '../../../services/jobs'

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readParamsAs(event, idParamSchema)
  const input = await readBodyAs(event, submitJobSchema)
  return submitJob(useDb(), user, id, input)
})
