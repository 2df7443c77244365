import { idParamSchema } from '#shared/schemas/auth'
import { sendJobTransitionMail } from '../../../services/job-mail'
import { startCut } from '../../../services/operations'

export default defineApiHandler(async (event) => {
  const staff = await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  await startCut(useDb(), staff, id)
  await sendJobTransitionMail(useDb(), { jobId: id, from: 'booked', to: 'cutting', action: 'startCutting' })
  return { ok: true }
})
