import { handleStripeEvent } from '../../services/payments'
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
  // What changed is on the ledger, each new entry with its receipt in the same transaction.
  await handleStripeEvent(useDb(), stripeEvent)
  return { received: true }
})
