import Stripe from 'stripe'
import { describe, expect, it } from 'vitest'
import { heldPayment, startFakeWithSdk, stripeErrorOf } from './helpers'

describe('Refunds after capture', () => {
  it('refunds part, then the rest by default, then refuses any more', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const held = await heldPayment(fake, stripe)
    const capturedMinor = 4000
    await stripe.paymentIntents.capture(held.id, { amount_to_capture: capturedMinor })

    const partial = await stripe.refunds.create({ payment_intent: held.id, amount: 1500, reason: 'requested_by_customer', metadata: { staff_note: 'offcut reused' } })
    expect(partial.id).toMatch(/^re_/)
    expect(partial.object).toBe('refund')
    expect(partial.amount).toBe(1500)
    expect(partial.status).toBe('succeeded')
    expect(partial.payment_intent).toBe(held.id)
    expect(partial.metadata).toEqual({ staff_note: 'offcut reused' })

    // API reference, "Create a refund": amount defaults to the entire remaining amount.
    const rest = await stripe.refunds.create({ payment_intent: held.id })
    expect(rest.amount).toBe(capturedMinor - 1500)

    const charge = await stripe.charges.retrieve(rest.charge as string)
    expect(charge.refunded).toBe(true)

    const more = await stripeErrorOf(stripe.refunds.create({ payment_intent: held.id, amount: 1 }))
    expect(more).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError)
    expect(more.code).toBe('charge_already_refunded')

    expect(await stripe.refunds.retrieve(partial.id)).toMatchObject({ id: partial.id, amount: 1500 })
  })

  it('refuses a refund larger than what was captured minus what was refunded', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const held = await heldPayment(fake, stripe)
    await stripe.paymentIntents.capture(held.id, { amount_to_capture: 3000 })
    await stripe.refunds.create({ payment_intent: held.id, amount: 1000 })

    // The uncaptured part of the hold is not refundable either: only 2000 of the 3000 captured are left.
    const error = await stripeErrorOf(stripe.refunds.create({ payment_intent: held.id, amount: 2001 }))
    expect(error).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError)
    expect(error.statusCode).toBe(400)
    expect(error.param).toBe('amount')
    const fine = await stripe.refunds.create({ payment_intent: held.id, amount: 2000 })
    expect(fine.amount).toBe(2000)
  })

  it('cannot refund a payment that is only held', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const held = await heldPayment(fake, stripe)
    const error = await stripeErrorOf(stripe.refunds.create({ payment_intent: held.id }))
    expect(error).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError)
  })

  it('records charge.refunded with the charge as it is after the refund', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const held = await heldPayment(fake, stripe)
    await stripe.paymentIntents.capture(held.id)
    await stripe.refunds.create({ payment_intent: held.id, amount: 700 })

    const events = await stripe.events.list({ type: 'charge.refunded' })
    expect(events.data).toHaveLength(1)
    const charge = events.data[0]!.data.object as Stripe.Charge
    expect(charge.object).toBe('charge')
    expect(charge.amount_refunded).toBe(700)
    expect(charge.payment_intent).toBe(held.id)
  })
})
