import { z } from 'zod'
import { invalidParam } from '../errors'
import { expandFields } from '../expand'
import type { FakeCheckoutSession, FakeLineItem } from '../objects'
import { currencyParam, expandOnlyParams, expandParam, formInteger, formPositiveInteger, metadataParam, paginationParams, parseParams } from '../params'
import { paginate } from '../lists'
import { expireCheckoutSession } from '../payment-flow'
import type { Route } from '../router'
import { findOrThrow, type StoredCheckoutSession, type StripeFakeState } from '../store'

const httpUrl = z.url({ protocol: /^https?$/ })

// The part of "Create a Checkout Session" (API reference) that Kerfbook uses; any other parameter is
// rejected as unknown, so a call the fake cannot honour fails loudly instead of being ignored.
const createSessionParams = z.strictObject({
  mode: z.enum(['payment'], { error: 'This fake supports mode=payment only' }),
  line_items: z
    .array(
      z.strictObject({
        price_data: z.strictObject({
          currency: currencyParam,
          unit_amount: formInteger,
          product_data: z.strictObject({ name: z.string().min(1), description: z.string().optional(), metadata: metadataParam }),
        }),
        quantity: formPositiveInteger,
      }),
    )
    .min(1),
  success_url: httpUrl.optional(),
  cancel_url: httpUrl.optional(),
  customer_email: z.email().optional(),
  client_reference_id: z.string().max(200).optional(),
  metadata: metadataParam,
  expires_at: formInteger.optional(),
  payment_method_types: z.array(z.literal('card', { error: 'This fake supports card payments only' })).optional(),
  payment_intent_data: z
    .strictObject({
      capture_method: z.enum(['automatic', 'automatic_async', 'manual']).optional(),
      description: z.string().optional(),
      metadata: metadataParam,
    })
    .optional(),
  expand: expandParam,
})

const listParams = z.strictObject(paginationParams)

// API reference: expires_at "can be anywhere from 30 minutes to 24 hours after Checkout Session creation"; 24 hours by default.
const MIN_LIFETIME_SECONDS = 30 * 60
const MAX_LIFETIME_SECONDS = 24 * 60 * 60

function buildLineItems(state: StripeFakeState, items: z.output<typeof createSessionParams>['line_items']): FakeLineItem[] {
  return items.map(({ price_data: priceData, quantity }) => {
    const amount = priceData.unit_amount * quantity
    return {
      id: state.newId('li_'),
      object: 'item',
      amount_discount: 0,
      amount_subtotal: amount,
      amount_tax: 0,
      amount_total: amount,
      currency: priceData.currency,
      description: priceData.product_data.name,
      quantity,
      // price_data makes a one-off price that is not offered again, hence inactive (from memory).
      price: {
        id: state.newId('price_'),
        object: 'price',
        active: false,
        currency: priceData.currency,
        livemode: false,
        product: state.newId('prod_'),
        type: 'one_time',
        unit_amount: priceData.unit_amount,
      },
    }
  })
}

function createSession(state: StripeFakeState, publicUrl: string, params: z.output<typeof createSessionParams>): StoredCheckoutSession {
  const lineItems = buildLineItems(state, params.line_items)
  const currency = lineItems[0]!.currency
  const otherCurrency = lineItems.findIndex((item) => item.currency !== currency)
  if (otherCurrency !== -1) throw invalidParam('All line items must use the same currency.', `line_items[${otherCurrency}][price_data][currency]`)
  const created = state.nowSeconds()
  const expiresAt = params.expires_at ?? created + MAX_LIFETIME_SECONDS
  if (expiresAt < created + MIN_LIFETIME_SECONDS || expiresAt > created + MAX_LIFETIME_SECONDS) {
    throw invalidParam('The `expires_at` timestamp must be between 30 minutes and 24 hours from Checkout Session creation.', 'expires_at')
  }
  const amount = lineItems.reduce((sum, item) => sum + item.amount_total, 0)
  const id = state.newId('cs_test_', 58)
  const session: FakeCheckoutSession = {
    id,
    object: 'checkout.session',
    amount_subtotal: amount,
    amount_total: amount,
    cancel_url: params.cancel_url ?? null,
    client_reference_id: params.client_reference_id ?? null,
    created,
    currency,
    customer: null,
    customer_details: null,
    customer_email: params.customer_email ?? null,
    expires_at: expiresAt,
    livemode: false,
    metadata: params.metadata ?? {},
    mode: 'payment',
    payment_intent: null,
    payment_method_types: ['card'],
    payment_status: 'unpaid',
    status: 'open',
    success_url: params.success_url ?? null,
    total_details: { amount_discount: 0, amount_shipping: 0, amount_tax: 0 },
    ui_mode: 'hosted',
    url: `${publicUrl}/checkout/${id}`,
  }
  const stored: StoredCheckoutSession = {
    session,
    lineItems,
    paymentIntentData: {
      captureMethod: params.payment_intent_data?.capture_method ?? 'automatic',
      description: params.payment_intent_data?.description ?? null,
      metadata: params.payment_intent_data?.metadata ?? {},
    },
    awaitingAuthentication: null,
  }
  state.checkoutSessions.set(id, stored)
  return stored
}

export function checkoutSessionRoutes(state: StripeFakeState, publicUrl: string): Route[] {
  const lineItemPage = (stored: StoredCheckoutSession, limit?: number, startingAfter?: string) =>
    paginate(stored.lineItems, `/v1/checkout/sessions/${stored.session.id}/line_items`, limit, startingAfter)
  const present = (stored: StoredCheckoutSession, expand: string[] | undefined) =>
    expandFields(stored.session, expand, {
      payment_intent: (session) => (typeof session.payment_intent === 'string' ? state.paymentIntents.get(session.payment_intent) : null),
      line_items: () => lineItemPage(stored),
    })
  const find = (id: string) => findOrThrow(state.checkoutSessions, id, 'checkout.session', 'session')

  return [
    {
      method: 'POST',
      pattern: '/v1/checkout/sessions',
      handler: ({ params }) => {
        const parsed = parseParams(createSessionParams, params)
        return present(createSession(state, publicUrl, parsed), parsed.expand)
      },
    },
    {
      method: 'GET',
      pattern: '/v1/checkout/sessions/:session',
      handler: ({ params, pathParams }) => present(find(pathParams.session!), parseParams(expandOnlyParams, params).expand),
    },
    {
      method: 'GET',
      pattern: '/v1/checkout/sessions/:session/line_items',
      handler: ({ params, pathParams }) => {
        const { limit, starting_after: startingAfter } = parseParams(listParams, params)
        return lineItemPage(find(pathParams.session!), limit, startingAfter)
      },
    },
    {
      method: 'POST',
      pattern: '/v1/checkout/sessions/:session/expire',
      handler: ({ params, pathParams, context }) => {
        const { expand } = parseParams(expandOnlyParams, params)
        const stored = find(pathParams.session!)
        expireCheckoutSession(state, stored, context)
        return present(stored, expand)
      },
    },
  ]
}
