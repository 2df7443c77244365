import { handleStripeEvent } from '../../services/payments'
import { sendPaymentReceipts } from '../../services/payment-mail'
import { InvalidInput } from '../../utils/errors'

// Stripe's events, accepted only with a valid Stripe-Signature (HMAC-SHA256, at most five minutes old).
export default defineApiHandler(async (event) => {
  const payload = await readRawBody(event, false)
  const signature = getRequestHeader(event, 'stripe-signature')
  if (!payload || !signature) throw new InvalidInput('Missing Stripe-Signature or body.')
  let stripeEvent
  try {
    stripeEvent = useStripe().webhooks.constructEvent(payload, signature, stripeConfig().webhookSecret, 300)
  } catch (error) {
    throw new InvalidInput(`Webhook refused: ${(error as Error).message}`)
  }
  const result = await handleStripeEvent(useDb(), stripeEvent)
  if (result?.newKinds.length) await sendPaymentReceipts(useDb(), { bookingId: result.booking.id, memberId: result.booking.member_id, kinds: result.newKinds })
  return { received: true }
})
