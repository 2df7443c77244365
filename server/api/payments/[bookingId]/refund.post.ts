import { z } from 'zod'
import { refundSchema } from '#shared/schemas/payments'
import { refundBooking } from '../../../services/payments'

const paramsSchema = z.object({ bookingId: z.coerce.number().int().positive() })

export default defineApiHandler(async (event) => {
  const staff = await requireRole(event, 'staff', 'admin')
  const { bookingId } = readParamsAs(event, paramsSchema)
  // The member's receipt is written with the ledger entry (services/payments.ts).
  return refundBooking(useDb(), staff, bookingId, await readBodyAs(event, refundSchema))
})
