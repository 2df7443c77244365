import { collectSchema } from '#shared/schemas/payments'
import { collectWithCode } from '../../services/operations'

export default defineApiHandler(async (event) => {
  const staff = await requireRole(event, 'staff', 'admin')
  const { code, handOverWithBalanceOwed } = await readBodyAs(event, collectSchema)
  const { job } = await collectWithCode(useDb(), staff, code, handOverWithBalanceOwed)
  return { jobId: job.id, title: job.title }
})
