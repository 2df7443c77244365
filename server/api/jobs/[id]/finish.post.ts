import { idParamSchema } from '#shared/schemas/auth'
import { finishCutSchema } from '#shared/schemas/payments'
import { sendJobTransitionMail } from '../../../services/job-mail'
import { finishCut } from '../../../services/operations'
import { sendPaymentReceipts } from '../../../services/payment-mail'

// Staff log the minutes actually cut; the card hold is captured for exactly what they cost.
export default defineApiHandler(async (event) => {
  const staff = await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  const { actualMinutes, note } = await readBodyAs(event, finishCutSchema)
  const settlement = await finishCut(useDb(), staff, id, actualMinutes, note)
  await sendJobTransitionMail(useDb(), { jobId: id, from: 'cutting', to: 'cut', action: 'finishCutting' })
  const booking = await useDb()('bookings').where({ job_id: id }).whereNot('status', 'cancelled').first('id', 'member_id')
  await sendPaymentReceipts(useDb(), {
    bookingId: booking.id,
    memberId: booking.member_id,
    kinds: settlement.newKinds,
    detail: `${actualMinutes} machine minutes used (estimated ${settlement.estimateMinutes}).${settlement.balanceUrl ? ` The cut cost more than the hold; please pay the rest here: ${settlement.balanceUrl}` : ''}`,
  })
  return settlement
})
