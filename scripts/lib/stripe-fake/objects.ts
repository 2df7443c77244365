import type Stripe from 'stripe'

// The fake's objects are subsets of the SDK's own generated types, so every field it returns has the
// name and type of Stripe's documented object (the SDK's types are generated from Stripe's OpenAPI spec).

export interface FakeCard {
  brand: string
  last4: string
  exp_month: number
  exp_year: number
  funding: 'credit'
}

export type FakePaymentIntent = Pick<
  Stripe.PaymentIntent,
  | 'id'
  | 'object'
  | 'amount'
  | 'amount_capturable'
  | 'amount_received'
  | 'canceled_at'
  | 'cancellation_reason'
  | 'capture_method'
  | 'client_secret'
  | 'created'
  | 'currency'
  | 'customer'
  | 'description'
  | 'last_payment_error'
  | 'latest_charge'
  | 'livemode'
  | 'metadata'
  | 'next_action'
  | 'payment_method'
  | 'payment_method_types'
  | 'receipt_email'
  | 'status'
>

export type FakeCharge = Pick<
  Stripe.Charge,
  | 'id'
  | 'object'
  | 'amount'
  | 'amount_captured'
  | 'amount_refunded'
  | 'captured'
  | 'created'
  | 'currency'
  | 'description'
  | 'failure_code'
  | 'failure_message'
  | 'livemode'
  | 'metadata'
  | 'paid'
  | 'payment_intent'
  | 'payment_method'
  | 'receipt_email'
  | 'refunded'
  | 'status'
> & { payment_method_details: { type: 'card'; card: FakeCard } }

export type FakeRefund = Pick<
  Stripe.Refund,
  'id' | 'object' | 'amount' | 'charge' | 'created' | 'currency' | 'metadata' | 'payment_intent' | 'reason' | 'status'
>

export type FakePrice = Pick<Stripe.Price, 'id' | 'object' | 'active' | 'currency' | 'livemode' | 'product' | 'type' | 'unit_amount'>

export type FakeLineItem = Pick<
  Stripe.LineItem,
  'id' | 'object' | 'amount_discount' | 'amount_subtotal' | 'amount_tax' | 'amount_total' | 'currency' | 'description' | 'quantity'
> & { price: FakePrice }

export type FakeCheckoutSession = Pick<
  Stripe.Checkout.Session,
  | 'id'
  | 'object'
  | 'amount_subtotal'
  | 'amount_total'
  | 'cancel_url'
  | 'client_reference_id'
  | 'created'
  | 'currency'
  | 'customer'
  | 'customer_details'
  | 'customer_email'
  | 'expires_at'
  | 'line_items'
  | 'livemode'
  | 'metadata'
  | 'mode'
  | 'payment_intent'
  | 'payment_method_types'
  | 'payment_status'
  | 'status'
  | 'success_url'
  | 'total_details'
  | 'ui_mode'
  | 'url'
>

export interface FakeEvent {
  id: string
  object: 'event'
  api_version: string
  created: number
  data: { object: unknown }
  livemode: false
  pending_webhooks: number
  request: { id: string | null; idempotency_key: string | null }
  type: string
}

export interface FakeList<Item> {
  object: 'list'
  data: Item[]
  has_more: boolean
  url: string
}
