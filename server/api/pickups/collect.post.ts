import { collectSchema } from '#shared/schemas/payments'
import { sendJobTransitionMail } from '../../services/job-mail'
import { collectWithCode } from '../../services/operations'

export default defineApiHandler(async (event) => {
  const staff = await requireRole(event, 'staff', 'admin')
  const { code, handOverWithBalanceOwed } = await readBodyAs(event, collectSchema)
  const { record, job } = await collectWithCode(useDb(), staff, code, handOverWithBalanceOwed)
  await sendJobTransitionMail(useDb(), record)
  return { jobId: job.id, title: job.title }
})
