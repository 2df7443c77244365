import { expandFields } from '../expand'
import { expandOnlyParams, parseParams } from '../params'
import type { Route } from '../router'
import { findOrThrow, type StripeFakeState } from '../store'

/** Retrieve a Charge: how much of a payment was captured and refunded. */
export function chargeRoutes(state: StripeFakeState): Route[] {
  return [
    {
      method: 'GET',
      pattern: '/v1/charges/:charge',
      handler: ({ params, pathParams }) =>
        expandFields(findOrThrow(state.charges, pathParams.charge!, 'charge', 'charge'), parseParams(expandOnlyParams, params).expand, {
          payment_intent: (charge) => state.paymentIntents.get(charge.payment_intent as string),
        }),
    },
  ]
}
