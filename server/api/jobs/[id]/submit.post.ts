import { idParamSchema } from '#shared/schemas/auth'
import { submitJobSchema } from '#shared/schemas/jobs'
import { sendJobTransitionMail } from '../../../services/job-mail'
import { submitJob } from '../../../services/jobs'

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readParamsAs(event, idParamSchema)
  const input = await readBodyAs(event, submitJobSchema)
  const record = await submitJob(useDb(), user, id, input)
  await sendJobTransitionMail(useDb(), record)
  return record
})
