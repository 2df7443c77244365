import { invalidParam, invalidRequest, unexpectedState } from './errors'
import type { FakeCard, FakeCharge, FakePaymentIntent, FakeRefund } from './objects'
import { CUSTOMER_ACTION, type RequestContext, type StoredCheckoutSession, type StripeFakeState } from './store'

// The state changes of a card payment, in one place for both the API and the checkout page.
// Statuses and transitions follow Stripe's API reference for PaymentIntents, Charges, Refunds and
// Checkout Sessions; where a detail comes from memory rather than the reference, the line says so.

/** Cancelable statuses, from the API reference for "Cancel a PaymentIntent". */
const CANCELABLE_STATUSES: FakePaymentIntent['status'][] = [
  'requires_payment_method',
  'requires_capture',
  'requires_confirmation',
  'requires_action',
  'processing',
]

function sessionOwning(state: StripeFakeState, paymentIntentId: string): StoredCheckoutSession | undefined {
  return [...state.checkoutSessions.values()].find((stored) => stored.session.payment_intent === paymentIntentId)
}

/** Since API version 2022-08-01 Checkout creates the PaymentIntent when the payer first confirms, not with the session. */
function paymentIntentFor(state: StripeFakeState, stored: StoredCheckoutSession): FakePaymentIntent {
  const existingId = stored.session.payment_intent
  if (typeof existingId === 'string') return state.paymentIntents.get(existingId)!
  const id = state.newId('pi_')
  const paymentIntent: FakePaymentIntent = {
    id,
    object: 'payment_intent',
    amount: stored.session.amount_total!,
    amount_capturable: 0,
    amount_received: 0,
    canceled_at: null,
    cancellation_reason: null,
    capture_method: stored.paymentIntentData.captureMethod,
    client_secret: `${id}_secret_${state.newId('')}`,
    created: state.nowSeconds(),
    currency: stored.session.currency!,
    customer: null,
    description: stored.paymentIntentData.description,
    last_payment_error: null,
    latest_charge: null,
    livemode: false,
    metadata: { ...stored.paymentIntentData.metadata },
    next_action: null,
    payment_method: null,
    payment_method_types: ['card'],
    receipt_email: null,
    status: 'requires_payment_method',
  }
  state.paymentIntents.set(id, paymentIntent)
  stored.session.payment_intent = id
  return paymentIntent
}

function createCharge(state: StripeFakeState, paymentIntent: FakePaymentIntent, card: FakeCard, outcome: 'authorised' | 'declined'): FakeCharge {
  const captured = outcome === 'authorised' && paymentIntent.capture_method !== 'manual'
  const charge: FakeCharge = {
    id: state.newId('ch_'),
    object: 'charge',
    amount: paymentIntent.amount,
    amount_captured: captured ? paymentIntent.amount : 0,
    amount_refunded: 0,
    captured,
    created: state.nowSeconds(),
    currency: paymentIntent.currency,
    description: paymentIntent.description,
    failure_code: outcome === 'declined' ? 'card_declined' : null,
    failure_message: outcome === 'declined' ? 'Your card was declined.' : null,
    livemode: false,
    metadata: { ...paymentIntent.metadata },
    // An authorised but uncaptured charge already has status "succeeded" and paid=true (Charges API reference).
    paid: outcome === 'authorised',
    payment_intent: paymentIntent.id,
    payment_method: paymentIntent.payment_method as string,
    receipt_email: paymentIntent.receipt_email,
    refunded: false,
    status: outcome === 'authorised' ? 'succeeded' : 'failed',
    payment_method_details: { type: 'card', card },
  }
  state.charges.set(charge.id, charge)
  paymentIntent.latest_charge = charge.id
  return charge
}

function failPayment(state: StripeFakeState, paymentIntent: FakePaymentIntent, error: NonNullable<FakePaymentIntent['last_payment_error']>): void {
  paymentIntent.status = 'requires_payment_method'
  paymentIntent.next_action = null
  paymentIntent.last_payment_error = error
  state.recordEvent('payment_intent.payment_failed', paymentIntent, CUSTOMER_ACTION)
}

function authorise(state: StripeFakeState, stored: StoredCheckoutSession, paymentIntent: FakePaymentIntent, card: FakeCard, email: string): void {
  createCharge(state, paymentIntent, card, 'authorised')
  paymentIntent.last_payment_error = null
  paymentIntent.next_action = null
  paymentIntent.receipt_email = email
  if (paymentIntent.capture_method === 'manual') {
    paymentIntent.status = 'requires_capture'
    paymentIntent.amount_capturable = paymentIntent.amount
    state.recordEvent('payment_intent.amount_capturable_updated', paymentIntent, CUSTOMER_ACTION)
  } else {
    paymentIntent.status = 'succeeded'
    paymentIntent.amount_received = paymentIntent.amount
    state.recordEvent('payment_intent.succeeded', paymentIntent, CUSTOMER_ACTION)
  }
  Object.assign(stored.session, {
    status: 'complete',
    // "paid" means the funds are available; a held (uncaptured) payment is not yet paid (from memory — rely on the PaymentIntent's status).
    payment_status: paymentIntent.status === 'succeeded' ? 'paid' : 'unpaid',
    customer_details: { email, name: null },
    url: null,
  })
  stored.awaitingAuthentication = null
  state.recordEvent('checkout.session.completed', stored.session, CUSTOMER_ACTION)
}

export type PaymentAttempt = { result: 'completed' } | { result: 'declined'; message: string } | { result: 'authentication_required' }

/** The payer submits a test card on the checkout page. */
export function attemptCardPayment(
  state: StripeFakeState,
  stored: StoredCheckoutSession,
  card: FakeCard,
  behaviour: 'authorises' | 'declines' | 'requires_authentication',
  email: string,
): PaymentAttempt {
  const paymentIntent = paymentIntentFor(state, stored)
  paymentIntent.payment_method = state.newId('pm_')
  if (behaviour === 'declines') {
    const charge = createCharge(state, paymentIntent, card, 'declined')
    const message = 'Your card was declined.'
    failPayment(state, paymentIntent, { type: 'card_error', code: 'card_declined', decline_code: 'generic_decline', message, charge: charge.id })
    return { result: 'declined', message }
  }
  if (behaviour === 'requires_authentication') {
    paymentIntent.status = 'requires_action'
    paymentIntent.next_action = { type: 'use_stripe_sdk', use_stripe_sdk: {} }
    stored.awaitingAuthentication = { card, email }
    return { result: 'authentication_required' }
  }
  authorise(state, stored, paymentIntent, card, email)
  return { result: 'completed' }
}

/** The payer answers the authentication step that card 4000 0025 0000 3155 asks for. */
export function finishAuthentication(state: StripeFakeState, stored: StoredCheckoutSession, approved: boolean): PaymentAttempt {
  const { card, email } = stored.awaitingAuthentication!
  const paymentIntent = paymentIntentFor(state, stored)
  stored.awaitingAuthentication = null
  if (approved) {
    authorise(state, stored, paymentIntent, card, email)
    return { result: 'completed' }
  }
  const message = 'We are unable to authenticate your payment method. Please choose a different payment method and try again.'
  failPayment(state, paymentIntent, { type: 'invalid_request_error', code: 'payment_intent_authentication_failure', message })
  return { result: 'declined', message }
}

/** Capture up to amount_capturable; the uncaptured rest of the hold is released (shown as refunded on the charge — from memory). */
export function capturePaymentIntent(
  state: StripeFakeState,
  paymentIntent: FakePaymentIntent,
  amountToCapture: number | undefined,
  context: RequestContext,
): void {
  if (paymentIntent.status !== 'requires_capture') {
    throw unexpectedState(
      'payment_intent',
      `This PaymentIntent could not be captured because it has a status of ${paymentIntent.status}. Only a PaymentIntent with one of the following statuses may be captured: requires_capture.`,
    )
  }
  const amount = amountToCapture ?? paymentIntent.amount_capturable
  if (amount > paymentIntent.amount_capturable) {
    throw invalidParam(
      `The amount to capture (${amount}) is greater than the amount capturable on this PaymentIntent (${paymentIntent.amount_capturable}).`,
      'amount_to_capture',
      'amount_too_large',
    )
  }
  const charge = state.charges.get(paymentIntent.latest_charge as string)!
  charge.captured = true
  charge.amount_captured = amount
  charge.amount_refunded = charge.amount - amount
  paymentIntent.status = 'succeeded'
  paymentIntent.amount_received = amount
  paymentIntent.amount_capturable = 0
  state.recordEvent('payment_intent.succeeded', paymentIntent, context)
}

export function cancelPaymentIntent(
  state: StripeFakeState,
  paymentIntent: FakePaymentIntent,
  reason: FakePaymentIntent['cancellation_reason'],
  context: RequestContext,
): void {
  if (!CANCELABLE_STATUSES.includes(paymentIntent.status)) {
    throw unexpectedState(
      'payment_intent',
      `You cannot cancel this PaymentIntent because it has a status of ${paymentIntent.status}. Only a PaymentIntent with one of the following statuses may be canceled: ${CANCELABLE_STATUSES.join(', ')}.`,
    )
  }
  // API reference: "You can't cancel the PaymentIntent for a Checkout Session. Expire the Checkout Session instead."
  if (sessionOwning(state, paymentIntent.id)?.session.status === 'open') {
    throw unexpectedState('payment_intent', 'This PaymentIntent belongs to an open Checkout Session; expire the Checkout Session instead.')
  }
  releaseHold(state, paymentIntent, reason)
  state.recordEvent('payment_intent.canceled', paymentIntent, context)
}

/** API reference: for a PaymentIntent in requires_capture, cancelling refunds the remaining amount_capturable. */
function releaseHold(state: StripeFakeState, paymentIntent: FakePaymentIntent, reason: FakePaymentIntent['cancellation_reason']): void {
  const charge = paymentIntent.latest_charge ? state.charges.get(paymentIntent.latest_charge as string) : undefined
  if (charge && charge.paid && !charge.captured) {
    charge.amount_refunded = charge.amount
    charge.refunded = true
  }
  paymentIntent.status = 'canceled'
  paymentIntent.amount_capturable = 0
  paymentIntent.canceled_at = state.nowSeconds()
  paymentIntent.cancellation_reason = reason
  paymentIntent.next_action = null
}

/** API reference: only an open session can be expired; its PaymentIntent, if the payer got that far, is canceled. */
export function expireCheckoutSession(state: StripeFakeState, stored: StoredCheckoutSession, context: RequestContext): void {
  if (stored.session.status !== 'open') {
    throw unexpectedState('checkout_session', `Only Checkout Sessions with a status in ["open"] can be expired. This session has status "${stored.session.status}".`)
  }
  stored.session.status = 'expired'
  stored.session.url = null
  stored.awaitingAuthentication = null
  const paymentIntentId = stored.session.payment_intent
  if (typeof paymentIntentId === 'string') {
    const paymentIntent = state.paymentIntents.get(paymentIntentId)!
    releaseHold(state, paymentIntent, 'abandoned')
    state.recordEvent('payment_intent.canceled', paymentIntent, context)
  }
  state.recordEvent('checkout.session.expired', stored.session, context)
}

/** Sessions past their expires_at expire on their own, as Stripe's do. */
export function expireOverdueSessions(state: StripeFakeState): void {
  const now = state.nowSeconds()
  for (const stored of state.checkoutSessions.values()) {
    if (stored.session.status === 'open' && stored.session.expires_at <= now) expireCheckoutSession(state, stored, CUSTOMER_ACTION)
  }
}

export interface RefundRequest {
  paymentIntent: FakePaymentIntent
  amount: number | undefined
  reason: FakeRefund['reason']
  metadata: Record<string, string>
}

/** API reference for refunds: partial refunds may repeat until the charge is fully refunded; never more than is left. */
export function refundPayment(state: StripeFakeState, request: RefundRequest, context: RequestContext): FakeRefund {
  const { paymentIntent } = request
  const charge = paymentIntent.latest_charge ? state.charges.get(paymentIntent.latest_charge as string) : undefined
  if (!charge || !charge.captured) {
    throw invalidRequest(`This PaymentIntent (${paymentIntent.id}) does not have a successful charge to refund.`, { code: 'charge_not_refundable' })
  }
  // amount_refunded includes the released rest of a partial capture, so what is left is exactly captured minus refunds.
  const refundable = charge.amount - charge.amount_refunded
  if (refundable === 0) {
    throw invalidRequest(`Charge ${charge.id} has already been refunded.`, { code: 'charge_already_refunded' })
  }
  const amount = request.amount ?? refundable
  if (amount > refundable) {
    throw invalidParam(`Refund amount (${amount}) is greater than unrefunded amount on charge (${refundable})`, 'amount', 'amount_too_large')
  }
  const refund: FakeRefund = {
    id: state.newId('re_'),
    object: 'refund',
    amount,
    charge: charge.id,
    created: state.nowSeconds(),
    currency: charge.currency,
    metadata: request.metadata,
    payment_intent: paymentIntent.id,
    reason: request.reason,
    // Card refunds in test mode succeed at once.
    status: 'succeeded',
  }
  state.refunds.set(refund.id, refund)
  charge.amount_refunded += amount
  charge.refunded = charge.amount_refunded === charge.amount
  state.recordEvent('charge.refunded', charge, context)
  return refund
}
