import Stripe from 'stripe'
import { describe, expect, it } from 'vitest'
import { bookingSessionParams, CARD_DECLINED, CARD_SUCCEEDS, heldPayment, payWithCard, startFakeWithSdk, stripeErrorOf } from './helpers'

describe('releasing a hold and expiring a checkout', () => {
  it('cancelling a held PaymentIntent releases the whole hold and charges nothing', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const held = await heldPayment(fake, stripe)

    const canceled = await stripe.paymentIntents.cancel(held.id, { cancellation_reason: 'requested_by_customer' })
    expect(canceled.status).toBe('canceled')
    expect(canceled.cancellation_reason).toBe('requested_by_customer')
    expect(canceled.amount_capturable).toBe(0)
    expect(canceled.amount_received).toBe(0)
    expect(canceled.canceled_at).not.toBeNull()

    // API reference, "Cancel a PaymentIntent": the remaining amount_capturable is refunded.
    const charge = await stripe.charges.retrieve(held.latest_charge as string)
    expect(charge.captured).toBe(false)
    expect(charge.amount_captured).toBe(0)
    expect(charge.refunded).toBe(true)

    expect((await stripeErrorOf(stripe.paymentIntents.capture(held.id))).code).toBe('payment_intent_unexpected_state')
    expect((await stripe.events.list({ type: 'payment_intent.canceled' })).data.map((event) => (event.data.object as Stripe.PaymentIntent).id)).toEqual([held.id])
  })

  it('cannot cancel a PaymentIntent that already succeeded', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const held = await heldPayment(fake, stripe)
    await stripe.paymentIntents.capture(held.id)
    const error = await stripeErrorOf(stripe.paymentIntents.cancel(held.id))
    expect(error).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError)
    expect(error.code).toBe('payment_intent_unexpected_state')
  })

  it('will not cancel the PaymentIntent of a still-open Checkout Session (API reference: expire the session instead)', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const session = await stripe.checkout.sessions.create(bookingSessionParams())
    await payWithCard(fake, session.id, CARD_DECLINED)
    const open = await stripe.checkout.sessions.retrieve(session.id)
    const error = await stripeErrorOf(stripe.paymentIntents.cancel(open.payment_intent as string))
    expect(error).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError)
  })

  it('expiring an open session closes its page and cancels its PaymentIntent', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const session = await stripe.checkout.sessions.create(bookingSessionParams())
    await payWithCard(fake, session.id, CARD_DECLINED)

    const expired = await stripe.checkout.sessions.expire(session.id)
    expect(expired.status).toBe('expired')
    expect(expired.url).toBeNull()
    expect((await stripe.paymentIntents.retrieve(expired.payment_intent as string)).status).toBe('canceled')
    expect((await fetch(`${fake.url}/checkout/${session.id}`)).status).toBe(410)
    expect((await payWithCard(fake, session.id, CARD_SUCCEEDS)).status).toBe(410)
    expect((await stripe.events.list({ type: 'checkout.session.expired' })).data).toHaveLength(1)

    const again = await stripeErrorOf(stripe.checkout.sessions.expire(session.id))
    expect(again).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError)
  })

  it('a session expires by itself at expires_at', async () => {
    let nowMs = Date.UTC(2031, 2, 14, 9, 0, 0)
    const { fake, stripe } = await startFakeWithSdk({ clock: () => nowMs })
    const holdSeconds = 30 * 60
    const session = await stripe.checkout.sessions.create(bookingSessionParams({ expires_at: nowMs / 1000 + holdSeconds }))

    nowMs += (holdSeconds - 1) * 1000
    expect((await stripe.checkout.sessions.retrieve(session.id)).status).toBe('open')
    nowMs += 1000
    expect((await stripe.checkout.sessions.retrieve(session.id)).status).toBe('expired')
    expect((await fetch(`${fake.url}/checkout/${session.id}`)).status).toBe(410)
  })

  it('rejects expires_at outside 30 minutes to 24 hours from creation (API reference)', async () => {
    const { stripe } = await startFakeWithSdk()
    const nowSeconds = Math.floor(Date.now() / 1000)
    for (const expiresAt of [nowSeconds + 29 * 60, nowSeconds + 25 * 60 * 60]) {
      const error = await stripeErrorOf(stripe.checkout.sessions.create(bookingSessionParams({ expires_at: expiresAt })))
      expect(error).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError)
      expect(error.param).toBe('expires_at')
    }
  })
})
