import { z } from 'zod'
import { bookingVisibleTo } from '../../../services/bookings'
import { openBalanceCheckout } from '../../../services/payments'

const paramsSchema = z.object({ bookingId: z.coerce.number().int().positive() })

// The member (or staff at the desk for them) opens a hosted checkout for what the cut cost beyond the hold.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { bookingId } = readParamsAs(event, paramsSchema)
  await bookingVisibleTo(useDb(), user, bookingId)
  return openBalanceCheckout(useDb(), bookingId)
})
