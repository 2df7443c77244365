import Stripe from 'stripe'
import { describe, expect, it } from 'vitest'
import { bookingSessionParams, heldPayment, startFakeWithSdk, stripeErrorOf } from './helpers'

// API reference, "Idempotent requests": the first response for a key is saved and returned for retries;
// the same key with other parameters is an error; results are not saved when parameters fail validation.
describe('Idempotency-Key', () => {
  it('replays the saved response for the same key and parameters, marked Idempotent-Replayed', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const first = await stripe.checkout.sessions.create(bookingSessionParams(), { idempotencyKey: 'booking-bk_demo_17-checkout' })
    const retry = await stripe.checkout.sessions.create(bookingSessionParams(), { idempotencyKey: 'booking-bk_demo_17-checkout' })

    expect(retry.id).toBe(first.id)
    expect(retry.lastResponse.headers['idempotent-replayed']).toBe('true')
    expect(first.lastResponse.headers['idempotent-replayed']).toBeUndefined()
    expect(fake.state.checkoutSessions.size).toBe(1)
  })

  it('a retried capture does not capture twice', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const held = await heldPayment(fake, stripe)
    const first = await stripe.paymentIntents.capture(held.id, { amount_to_capture: 2500 }, { idempotencyKey: 'capture-bk_demo_17' })
    const retry = await stripe.paymentIntents.capture(held.id, { amount_to_capture: 2500 }, { idempotencyKey: 'capture-bk_demo_17' })
    expect(retry.status).toBe('succeeded')
    expect(retry.amount_received).toBe(first.amount_received)
    expect((await stripe.events.list({ type: 'payment_intent.succeeded' })).data).toHaveLength(1)
  })

  it('the same key with different parameters is an idempotency_error', async () => {
    const { stripe } = await startFakeWithSdk()
    await stripe.checkout.sessions.create(bookingSessionParams(), { idempotencyKey: 'booking-bk_demo_17-checkout' })
    const error = await stripeErrorOf(
      stripe.checkout.sessions.create(bookingSessionParams({ client_reference_id: 'bk_demo_99' }), { idempotencyKey: 'booking-bk_demo_17-checkout' }),
    )
    expect(error).toBeInstanceOf(Stripe.errors.StripeIdempotencyError)
    expect(error.type).toBe('StripeIdempotencyError')
    expect(error.statusCode).toBe(400)
  })

  it('saves no result for a request that failed validation, so the key can be used once fixed', async () => {
    const { stripe } = await startFakeWithSdk()
    const invalid = await stripeErrorOf(stripe.checkout.sessions.create(bookingSessionParams({ success_url: 'not a url' }), { idempotencyKey: 'booking-bk_demo_20' }))
    expect(invalid).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError)
    const fixed = await stripe.checkout.sessions.create(bookingSessionParams(), { idempotencyKey: 'booking-bk_demo_20' })
    expect(fixed.object).toBe('checkout.session')
  })

  it('keys belong to one API key', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const otherAccount = new Stripe('sk_test_other_workshop', { host: '127.0.0.1', port: fake.port, protocol: 'http' })
    const mine = await stripe.checkout.sessions.create(bookingSessionParams(), { idempotencyKey: 'shared-key' })
    const theirs = await otherAccount.checkout.sessions.create(bookingSessionParams(), { idempotencyKey: 'shared-key' })
    expect(theirs.id).not.toBe(mine.id)
  })
})
