import Stripe from 'stripe'
import { afterEach } from 'vitest'
import { startStripeFake, type StripeFake, type StripeFakeOptions } from '../../../scripts/lib/stripe-fake/index'

// Stripe's published test card numbers (Stripe testing docs: "Cards by brand", "Declined payments", "3D Secure authentication").
export const CARD_SUCCEEDS = '4242 4242 4242 4242'
export const CARD_DECLINED = '4000 0000 0000 0002'
export const CARD_NEEDS_AUTHENTICATION = '4000 0025 0000 3155'

// Invented demo booking: 45 estimated laser minutes at 1.20 EUR a minute plus an 8.00 EUR setup fee.
export const LASER_RATE_MINOR_PER_MIN = 120
export const ESTIMATED_MINUTES = 45
export const SETUP_FEE_MINOR = 800
export const ESTIMATE_TOTAL_MINOR = ESTIMATED_MINUTES * LASER_RATE_MINOR_PER_MIN + SETUP_FEE_MINOR

export const SUCCESS_URL = 'http://127.0.0.1:3999/bookings/bk_demo_17/paid?session={CHECKOUT_SESSION_ID}'
export const CANCEL_URL = 'http://127.0.0.1:3999/bookings/bk_demo_17'

const running: StripeFake[] = []
afterEach(async () => {
  await Promise.all(running.splice(0).map((fake) => fake.close()))
})

/** A fresh fake and the official SDK pointed at it, as the app will configure it. */
export async function startFakeWithSdk(options: StripeFakeOptions = {}): Promise<{ fake: StripeFake; stripe: Stripe }> {
  const fake = await startStripeFake(options)
  running.push(fake)
  const stripe = new Stripe('sk_test_kerfbook_unit', { host: '127.0.0.1', port: fake.port, protocol: 'http' })
  return { fake, stripe }
}

export function bookingSessionParams(overrides: Partial<Stripe.Checkout.SessionCreateParams> = {}): Stripe.Checkout.SessionCreateParams {
  return {
    mode: 'payment',
    line_items: [
      { price_data: { currency: 'eur', unit_amount: LASER_RATE_MINOR_PER_MIN, product_data: { name: 'Laser cutter minutes (estimate)' } }, quantity: ESTIMATED_MINUTES },
      { price_data: { currency: 'eur', unit_amount: SETUP_FEE_MINOR, product_data: { name: 'Machine setup' } }, quantity: 1 },
    ],
    payment_intent_data: { capture_method: 'manual', metadata: { booking_id: 'bk_demo_17' } },
    metadata: { booking_id: 'bk_demo_17' },
    client_reference_id: 'bk_demo_17',
    customer_email: 'ada.member@example.org',
    success_url: SUCCESS_URL,
    cancel_url: CANCEL_URL,
    ...overrides,
  }
}

/** Submits the hosted checkout form as a browser would (form POST, redirects not followed). */
export function submitCheckoutForm(fake: StripeFake, sessionId: string, step: 'pay' | 'authenticate' | 'cancel', fields: Record<string, string> = {}): Promise<Response> {
  return fetch(`${fake.url}/checkout/${sessionId}/${step}`, {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams(fields),
    redirect: 'manual',
  })
}

export function payWithCard(fake: StripeFake, sessionId: string, cardNumber: string): Promise<Response> {
  return submitCheckoutForm(fake, sessionId, 'pay', { number: cardNumber, expiry: '12 / 34', cvc: '123', name: 'Ada Member' })
}

/** A booking session paid with the card that succeeds, so its payment is held (requires_capture). */
export async function heldPayment(fake: StripeFake, stripe: Stripe): Promise<Stripe.PaymentIntent> {
  const session = await stripe.checkout.sessions.create(bookingSessionParams())
  const response = await payWithCard(fake, session.id, CARD_SUCCEEDS)
  if (response.status !== 303) throw new Error(`paying the checkout page answered ${response.status}`)
  const paid = await stripe.checkout.sessions.retrieve(session.id, { expand: ['payment_intent'] })
  return paid.payment_intent as Stripe.PaymentIntent
}

/** The StripeError a call rejects with, so tests can assert on its class and fields. */
export async function stripeErrorOf(call: Promise<unknown>): Promise<Stripe.errors.StripeError> {
  try {
    await call
  } catch (error) {
    if (error instanceof Stripe.errors.StripeError) return error
    throw error
  }
  throw new Error('expected the Stripe call to fail')
}
