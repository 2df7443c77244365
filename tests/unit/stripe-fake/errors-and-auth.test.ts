import Stripe from 'stripe'
import { describe, expect, it } from 'vitest'
import { bookingSessionParams, startFakeWithSdk, stripeErrorOf } from './helpers'

// API reference, "Errors": invalid_request_error with HTTP 400 for bad parameters and 404 with code
// resource_missing for an unknown id; 401 for a missing or invalid key. The SDK maps these to its error classes.
describe('Stripe-shaped errors', () => {
  it.each([
    ['payment intent', (stripe: Stripe) => stripe.paymentIntents.retrieve('pi_doesnotexist')],
    ['checkout session', (stripe: Stripe) => stripe.checkout.sessions.retrieve('cs_test_doesnotexist')],
    ['refund', (stripe: Stripe) => stripe.refunds.retrieve('re_doesnotexist')],
    ['event', (stripe: Stripe) => stripe.events.retrieve('evt_doesnotexist')],
  ])('an unknown %s id is a 404 resource_missing', async (_name, call) => {
    const { stripe } = await startFakeWithSdk()
    const error = await stripeErrorOf(call(stripe))
    expect(error).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError)
    expect(error.statusCode).toBe(404)
    expect(error.code).toBe('resource_missing')
    expect(error.message).toMatch(/doesnotexist/)
  })

  it('a key that is not a test secret key is a StripeAuthenticationError', async () => {
    const { fake } = await startFakeWithSdk()
    for (const key of ['sk_live_not_for_the_fake', 'pk_test_publishable', 'nonsense']) {
      const stripe = new Stripe(key, { host: '127.0.0.1', port: fake.port, protocol: 'http' })
      const error = await stripeErrorOf(stripe.checkout.sessions.create(bookingSessionParams()))
      expect(error).toBeInstanceOf(Stripe.errors.StripeAuthenticationError)
      expect(error.statusCode).toBe(401)
    }
  })

  it('accepts the key as HTTP basic auth user name and refuses a request without a key', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const session = await stripe.checkout.sessions.create(bookingSessionParams())
    const basic = await fetch(`${fake.url}/v1/checkout/sessions/${session.id}`, { headers: { authorization: `Basic ${Buffer.from('sk_test_curl:').toString('base64')}` } })
    expect(basic.status).toBe(200)
    const anonymous = await fetch(`${fake.url}/v1/checkout/sessions/${session.id}`)
    expect(anonymous.status).toBe(401)
    const body = (await anonymous.json()) as { error: { type: string; message: string } }
    expect(body.error.type).toBe('invalid_request_error')
    expect(body.error.message).toMatch(/API key/)
  })

  it('names the parameter in bracket notation when one is missing, unknown or invalid', async () => {
    const { stripe } = await startFakeWithSdk()
    const base = bookingSessionParams()
    const [firstItem] = base.line_items!

    const missing = await stripeErrorOf(
      stripe.checkout.sessions.create({ ...base, line_items: [{ ...firstItem, price_data: { unit_amount: 120, product_data: { name: 'Laser' } } as Stripe.Checkout.SessionCreateParams.LineItem.PriceData }] }),
    )
    expect(missing).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError)
    expect(missing.param).toBe('line_items[0][price_data][currency]')
    expect(missing.code).toBe('parameter_missing')

    const unknown = await stripeErrorOf(stripe.checkout.sessions.create({ ...base, locale: 'de' }))
    expect(unknown.param).toBe('locale')
    expect(unknown.code).toBe('parameter_unknown')
  })

  it('rejects a non-integer amount sent as raw form data, naming the parameter', async () => {
    const { fake } = await startFakeWithSdk()
    const form = new URLSearchParams({
      mode: 'payment',
      'line_items[0][price_data][currency]': 'eur',
      'line_items[0][price_data][unit_amount]': '1.20',
      'line_items[0][price_data][product_data][name]': 'Laser cutter minutes',
      'line_items[0][quantity]': '45',
    })
    const response = await fetch(`${fake.url}/v1/checkout/sessions`, { method: 'POST', headers: { authorization: 'Bearer sk_test_curl' }, body: form })
    expect(response.status).toBe(400)
    const { error } = (await response.json()) as { error: { type: string; param: string; message: string } }
    expect(error.type).toBe('invalid_request_error')
    expect(error.param).toBe('line_items[0][price_data][unit_amount]')
    expect(error.message).toMatch(/Invalid integer/)
  })

  it('an unknown endpoint is a 404 invalid_request_error', async () => {
    const { stripe } = await startFakeWithSdk()
    const error = await stripeErrorOf(stripe.customers.create({ email: 'ada.member@example.org' }))
    expect(error).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError)
    expect(error.statusCode).toBe(404)
  })
})
