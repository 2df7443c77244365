import type Stripe from 'stripe'
import { describe, expect, it } from 'vitest'
import { heldPayment, startFakeWithSdk } from './helpers'

describe('Events API', () => {
  it('records the payment lifecycle as Stripe events, newest first', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const held = await heldPayment(fake, stripe)
    await stripe.paymentIntents.capture(held.id, { amount_to_capture: 3000 })
    await stripe.refunds.create({ payment_intent: held.id, amount: 500 })

    const events = await stripe.events.list()
    expect(events.object).toBe('list')
    expect(events.data.map((event) => event.type)).toEqual([
      'charge.refunded',
      'payment_intent.succeeded',
      'checkout.session.completed',
      'payment_intent.amount_capturable_updated',
    ])
    for (const event of events.data) {
      expect(event.id).toMatch(/^evt_/)
      expect(event.object).toBe('event')
      expect(event.livemode).toBe(false)
    }
    // The object in an event is a snapshot taken when it happened, not the object as it is now.
    const capturable = events.data.find((event) => event.type === 'payment_intent.amount_capturable_updated')!
    expect((capturable.data.object as Stripe.PaymentIntent).status).toBe('requires_capture')
    // Events caused by an API call carry its idempotency key (the SDK adds one to every POST it may retry).
    const succeeded = events.data.find((event) => event.type === 'payment_intent.succeeded')!
    expect(succeeded.request?.idempotency_key).toMatch(/^stripe-node-retry-/)
  })

  it('filters by type with a wildcard and pages with limit and starting_after', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const held = await heldPayment(fake, stripe)
    await stripe.paymentIntents.capture(held.id)

    const paymentIntentEvents = await stripe.events.list({ type: 'payment_intent.*' })
    expect(paymentIntentEvents.data.map((event) => event.type)).toEqual(['payment_intent.succeeded', 'payment_intent.amount_capturable_updated'])

    const firstPage = await stripe.events.list({ limit: 2 })
    expect(firstPage.data).toHaveLength(2)
    expect(firstPage.has_more).toBe(true)
    const secondPage = await stripe.events.list({ limit: 2, starting_after: firstPage.data[1]!.id })
    expect(secondPage.data.map((event) => event.type)).toEqual(['payment_intent.amount_capturable_updated'])
    expect(secondPage.has_more).toBe(false)

    // The SDK's auto-pagination walks the same cursor.
    const all: string[] = []
    for await (const event of stripe.events.list({ limit: 1 })) all.push(event.id)
    expect(all).toEqual([...firstPage.data, ...secondPage.data].map((event) => event.id))

    expect((await stripe.events.retrieve(firstPage.data[0]!.id)).type).toBe('payment_intent.succeeded')
  })
})
