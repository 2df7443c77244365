import { pageQuerySchema } from '#shared/schemas/paging'
import { listPayments, listPaymentsPage } from '../../services/payment-list'

// The member's own payments; in pages with `limit`.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { limit, cursor } = readQueryAs(event, pageQuerySchema)
  return limit ? listPaymentsPage(useDb(), { memberId: user.id }, { limit, cursor }) : listPayments(useDb(), { memberId: user.id })
})
