import { z } from 'zod'
import { expandFields } from '../expand'
import type { FakePaymentIntent } from '../objects'
import { expandOnlyParams, expandParam, formPositiveInteger, parseParams } from '../params'
import { cancelPaymentIntent, capturePaymentIntent } from '../payment-flow'
import type { Route } from '../router'
import { findOrThrow, type StripeFakeState } from '../store'

const captureParams = z.strictObject({ amount_to_capture: formPositiveInteger.optional(), expand: expandParam })
const cancelParams = z.strictObject({
  cancellation_reason: z.enum(['duplicate', 'fraudulent', 'requested_by_customer', 'abandoned']).optional(),
  expand: expandParam,
})

export function paymentIntentRoutes(state: StripeFakeState): Route[] {
  const find = (id: string) => findOrThrow(state.paymentIntents, id, 'payment_intent', 'intent')
  const present = (paymentIntent: FakePaymentIntent, expand: string[] | undefined) =>
    expandFields(paymentIntent, expand, {
      latest_charge: (intent) => (typeof intent.latest_charge === 'string' ? state.charges.get(intent.latest_charge) : null),
    })

  return [
    {
      method: 'GET',
      pattern: '/v1/payment_intents/:intent',
      handler: ({ params, pathParams }) => present(find(pathParams.intent!), parseParams(expandOnlyParams, params).expand),
    },
    {
      method: 'POST',
      pattern: '/v1/payment_intents/:intent/capture',
      handler: ({ params, pathParams, context }) => {
        const { amount_to_capture: amountToCapture, expand } = parseParams(captureParams, params)
        const paymentIntent = find(pathParams.intent!)
        capturePaymentIntent(state, paymentIntent, amountToCapture, context)
        return present(paymentIntent, expand)
      },
    },
    {
      method: 'POST',
      pattern: '/v1/payment_intents/:intent/cancel',
      handler: ({ params, pathParams, context }) => {
        const { cancellation_reason: reason, expand } = parseParams(cancelParams, params)
        const paymentIntent = find(pathParams.intent!)
        cancelPaymentIntent(state, paymentIntent, reason ?? null, context)
        return present(paymentIntent, expand)
      },
    },
  ]
}
