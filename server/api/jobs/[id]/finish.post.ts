import { idParamSchema } from '#shared/schemas/auth'
import { finishCutSchema } from '#shared/schemas/payments'
import { finishCut } from '../../../services/operations'
import { sendPaymentReceipts } from '../../../services/payment-mail'

// Staff log the minutes actually cut (or take the timer's); the card hold is captured for exactly what they cost.
export default defineApiHandler(async (event) => {
  const staff = await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  const input = await readBodyAs(event, finishCutSchema)
  const { settlement } = await finishCut(useDb(), staff, id, input.actualMinutes, input.note, input.confirmedChargeMinor)
  await sendPaymentReceipts(useDb(), {
    bookingId: settlement.bookingId,
    memberId: settlement.memberId,
    kinds: settlement.newKinds,
    detail: `${settlement.actualMinutes} machine minutes used (estimated ${settlement.estimateMinutes}).${settlement.balanceUrl ? ` The cut cost more than the hold; please pay the rest here: ${settlement.balanceUrl}` : ''}`,
  })
  return settlement
})
