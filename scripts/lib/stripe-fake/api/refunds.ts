import { z } from 'zod'
import { invalidParam } from '../errors'
import { expandFields } from '../expand'
import type { FakeRefund } from '../objects'
import { expandOnlyParams, expandParam, formPositiveInteger, metadataParam, parseParams } from '../params'
import { refundPayment } from '../payment-flow'
import type { Route } from '../router'
import { findOrThrow, type StripeFakeState } from '../store'

const createRefundParams = z.strictObject({
  payment_intent: z.string().optional(),
  charge: z.string().optional(),
  amount: formPositiveInteger.optional(),
  reason: z.enum(['duplicate', 'fraudulent', 'requested_by_customer']).optional(),
  metadata: metadataParam,
  expand: expandParam,
})

export function refundRoutes(state: StripeFakeState): Route[] {
  const present = (refund: FakeRefund, expand: string[] | undefined) =>
    expandFields(refund, expand, {
      charge: (r) => state.charges.get(r.charge as string),
      payment_intent: (r) => state.paymentIntents.get(r.payment_intent as string),
    })

  /** A refund names its payment by PaymentIntent or by Charge (API reference, "Create a refund"). */
  const paymentIntentToRefund = (params: z.output<typeof createRefundParams>) => {
    if (params.payment_intent) return findOrThrow(state.paymentIntents, params.payment_intent, 'payment_intent', 'payment_intent')
    if (params.charge) {
      const charge = findOrThrow(state.charges, params.charge, 'charge', 'charge')
      return state.paymentIntents.get(charge.payment_intent as string)!
    }
    throw invalidParam('One of the following params should be provided for this request: payment_intent or charge.', 'payment_intent', 'parameter_missing')
  }

  return [
    {
      method: 'POST',
      pattern: '/v1/refunds',
      handler: ({ params, context }) => {
        const parsed = parseParams(createRefundParams, params)
        const refund = refundPayment(
          state,
          { paymentIntent: paymentIntentToRefund(parsed), amount: parsed.amount, reason: parsed.reason ?? null, metadata: parsed.metadata ?? {} },
          context,
        )
        return present(refund, parsed.expand)
      },
    },
    {
      method: 'GET',
      pattern: '/v1/refunds/:refund',
      handler: ({ params, pathParams }) => present(findOrThrow(state.refunds, pathParams.refund!, 'refund', 'refund'), parseParams(expandOnlyParams, params).expand),
    },
  ]
}
