import { listPayments } from '../../services/payments'

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  return listPayments(useDb(), { memberId: user.id })
})
