import Stripe from 'stripe'
import { describe, expect, it } from 'vitest'
import {
  bookingSessionParams,
  CARD_SUCCEEDS,
  ESTIMATE_TOTAL_MINOR,
  heldPayment,
  payWithCard,
  startFakeWithSdk,
  stripeErrorOf,
  SUCCESS_URL,
} from './helpers'

describe('Checkout Session with manual capture, through the official SDK', () => {
  it('creates a Stripe-shaped open session whose url is the local checkout page', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const session = await stripe.checkout.sessions.create(bookingSessionParams())

    // API reference, Checkout Session object: id, object, livemode, amounts in minor units, created in Unix seconds.
    expect(session.id).toMatch(/^cs_test_/)
    expect(session.object).toBe('checkout.session')
    expect(session.livemode).toBe(false)
    expect(session.status).toBe('open')
    expect(session.payment_status).toBe('unpaid')
    expect(session.amount_total).toBe(ESTIMATE_TOTAL_MINOR)
    expect(session.currency).toBe('eur')
    expect(session.metadata).toEqual({ booking_id: 'bk_demo_17' })
    expect(session.client_reference_id).toBe('bk_demo_17')
    expect(Math.abs(session.created - Date.now() / 1000)).toBeLessThan(60)
    // API reference: expires_at defaults to 24 hours after creation.
    expect(session.expires_at - session.created).toBe(24 * 60 * 60)
    expect(session.url).toBe(`${fake.url}/checkout/${session.id}`)
    // The PaymentIntent is created when the payer confirms (API version 2022-08-01 changelog), not with the session.
    expect(session.payment_intent).toBeNull()
    // success_url keeps its placeholder until the redirect.
    expect(session.success_url).toBe(SUCCESS_URL)
  })

  it('paying 4242… on the page completes the session and holds the whole amount', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const session = await stripe.checkout.sessions.create(bookingSessionParams())

    const response = await payWithCard(fake, session.id, CARD_SUCCEEDS)
    expect(response.status).toBe(303)
    expect(response.headers.get('location')).toBe(SUCCESS_URL.replace('{CHECKOUT_SESSION_ID}', session.id))

    const completed = await stripe.checkout.sessions.retrieve(session.id, { expand: ['payment_intent'] })
    expect(completed.status).toBe('complete')
    expect(completed.customer_details?.email).toBe('ada.member@example.org')
    const paymentIntent = completed.payment_intent as Stripe.PaymentIntent
    expect(paymentIntent.id).toMatch(/^pi_/)
    expect(paymentIntent.object).toBe('payment_intent')
    // Capture-later docs: a manual-capture PaymentIntent waits in requires_capture with the authorised amount capturable.
    expect(paymentIntent.status).toBe('requires_capture')
    expect(paymentIntent.capture_method).toBe('manual')
    expect(paymentIntent.amount).toBe(ESTIMATE_TOTAL_MINOR)
    expect(paymentIntent.amount_capturable).toBe(ESTIMATE_TOTAL_MINOR)
    expect(paymentIntent.amount_received).toBe(0)
    expect(paymentIntent.metadata).toEqual({ booking_id: 'bk_demo_17' })

    const retrieved = await stripe.paymentIntents.retrieve(paymentIntent.id, { expand: ['latest_charge'] })
    const charge = retrieved.latest_charge as Stripe.Charge
    expect(charge.id).toMatch(/^ch_/)
    expect(charge.captured).toBe(false)
    expect(charge.payment_method_details?.card?.last4).toBe('4242')
  })

  it('capturing less than authorised succeeds with amount_received equal to the captured amount', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const held = await heldPayment(fake, stripe)
    // The cut took 37 of the 45 estimated minutes.
    const actualMinor = 37 * 120 + 800

    const captured = await stripe.paymentIntents.capture(held.id, { amount_to_capture: actualMinor })
    expect(captured.status).toBe('succeeded')
    expect(captured.amount_received).toBe(actualMinor)
    expect(captured.amount_capturable).toBe(0)

    const again = await stripeErrorOf(stripe.paymentIntents.capture(held.id))
    expect(again).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError)
    expect(again.code).toBe('payment_intent_unexpected_state')
  })

  it('refuses to capture more than amount_capturable and leaves the hold as it was', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const held = await heldPayment(fake, stripe)

    const error = await stripeErrorOf(stripe.paymentIntents.capture(held.id, { amount_to_capture: held.amount_capturable + 1 }))
    expect(error).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError)
    expect(error.statusCode).toBe(400)
    expect(error.param).toBe('amount_to_capture')
    const unchanged = await stripe.paymentIntents.retrieve(held.id)
    expect(unchanged.status).toBe('requires_capture')
    expect(unchanged.amount_capturable).toBe(ESTIMATE_TOTAL_MINOR)
  })

  it('with automatic capture the payment succeeds at once and the session is paid', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const session = await stripe.checkout.sessions.create(bookingSessionParams({ payment_intent_data: { metadata: { booking_id: 'bk_demo_18' } } }))
    await payWithCard(fake, session.id, CARD_SUCCEEDS)

    const completed = await stripe.checkout.sessions.retrieve(session.id, { expand: ['payment_intent'] })
    expect(completed.payment_status).toBe('paid')
    const paymentIntent = completed.payment_intent as Stripe.PaymentIntent
    expect(paymentIntent.status).toBe('succeeded')
    expect(paymentIntent.amount_received).toBe(ESTIMATE_TOTAL_MINOR)
  })

  it('lists the line items with their amounts in minor units', async () => {
    const { stripe } = await startFakeWithSdk()
    const session = await stripe.checkout.sessions.create(bookingSessionParams())
    const items = await stripe.checkout.sessions.listLineItems(session.id)
    expect(items.data.map((item) => [item.description, item.quantity, item.amount_total])).toEqual([
      ['Laser cutter minutes (estimate)', 45, 45 * 120],
      ['Machine setup', 1, 800],
    ])
  })
})
