import { memberBalancesOwed } from '../../services/balance'

// What the member still owes, booking by booking (a cut that took longer than its hold): never paged, always first.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  return memberBalancesOwed(useDb(), user.id)
})
