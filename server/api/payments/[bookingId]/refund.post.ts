import { z } from 'zod'
import { refundSchema } from '#shared/schemas/payments'
import { refundBooking } from '../../../services/payments'
import { sendPaymentReceipts } from '../../../services/payment-mail'

const paramsSchema = z.object({ bookingId: z.coerce.number().int().positive() })

export default defineApiHandler(async (event) => {
  const staff = await requireRole(event, 'staff', 'admin')
  const { bookingId } = readParamsAs(event, paramsSchema)
  const entry = await refundBooking(useDb(), staff, bookingId, await readBodyAs(event, refundSchema))
  await sendPaymentReceipts(useDb(), { bookingId, memberId: entry.member_id, kinds: ['refunded'] })
  return entry
})
