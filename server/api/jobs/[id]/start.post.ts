import { idParamSchema } from '#shared/schemas/auth'
import { sendJobTransitionMail } from '../../../services/job-mail'
import { startCut } from '../../../services/operations'

// The cut begins: the job goes on the machine and the timer starts on server time.
export default defineApiHandler(async (event) => {
  const staff = await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  const record = await startCut(useDb(), staff, id)
  await sendJobTransitionMail(useDb(), record)
  return record
})
