import { idParamSchema } from '#shared/schemas/auth'
import { jobDetail } from '../../services/jobs'

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readParamsAs(event, idParamSchema)
  return jobDetail(useDb(), user, id)
})
