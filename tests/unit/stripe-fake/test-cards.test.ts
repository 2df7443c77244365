import type Stripe from 'stripe'
import { describe, expect, it } from 'vitest'
import {
  bookingSessionParams,
  CARD_DECLINED,
  CARD_NEEDS_AUTHENTICATION,
  CARD_SUCCEEDS,
  ESTIMATE_TOTAL_MINOR,
  payWithCard,
  startFakeWithSdk,
  submitCheckoutForm,
  SUCCESS_URL,
} from './helpers'

/** A failed attempt leaves the session open and its PaymentIntent back at requires_payment_method (PaymentIntents API reference). */
async function expectOpenAfterFailedPayment(stripe: Stripe, sessionId: string, errorCode: string): Promise<Stripe.PaymentIntent> {
  const session = await stripe.checkout.sessions.retrieve(sessionId, { expand: ['payment_intent'] })
  expect(session.status).toBe('open')
  const paymentIntent = session.payment_intent as Stripe.PaymentIntent
  expect(paymentIntent.status).toBe('requires_payment_method')
  expect(paymentIntent.last_payment_error?.code).toBe(errorCode)
  return paymentIntent
}

describe('the hosted checkout stand-in page and Stripe test cards', () => {
  it('serves a form whose every input has a label, with no external assets', async () => {
    const { stripe } = await startFakeWithSdk()
    const session = await stripe.checkout.sessions.create(bookingSessionParams({ customer_email: undefined }))
    const page = await fetch(session.url!)
    expect(page.status).toBe(200)
    expect(page.headers.get('content-type')).toMatch(/^text\/html/)
    const html = await page.text()

    const inputIds = [...html.matchAll(/<input id="([^"]+)"/g)].map((match) => match[1])
    expect(inputIds).toEqual(expect.arrayContaining(['field-email', 'field-number', 'field-expiry', 'field-cvc']))
    for (const id of inputIds) expect(html).toContain(`<label for="${id}">`)
    expect(html).toContain(':focus-visible')
    expect(html).not.toMatch(/<(script|link)\b|src="http/)
    // 45 minutes at €1.20 plus €8.00 setup, shown with the currency's two decimals.
    expect(html).toContain('€62.00')
  })

  it('escapes what it echoes from the session and from the form', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const session = await stripe.checkout.sessions.create(
      bookingSessionParams({ line_items: [{ price_data: { currency: 'eur', unit_amount: 500, product_data: { name: 'Acrylic <script>alert(1)</script>' } }, quantity: 1 }] }),
    )
    const html = await (await fetch(session.url!)).text()
    expect(html).not.toContain('<script>alert(1)</script>')
    expect(html).toContain('Acrylic &lt;script&gt;alert(1)&lt;/script&gt;')

    const echoed = await (await submitCheckoutForm(fake, session.id, 'pay', { number: '"><img src=x onerror=alert(1)>', expiry: '12/34', cvc: '123' })).text()
    expect(echoed).not.toContain('<img src=x')
    expect(echoed).toContain('&quot;&gt;&lt;img src=x onerror=alert(1)&gt;')
  })

  it('4000 0000 0000 0002 is declined: the page says so, the session stays open and a later 4242 pays', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const session = await stripe.checkout.sessions.create(bookingSessionParams())

    const declined = await payWithCard(fake, session.id, CARD_DECLINED)
    expect(declined.status).toBe(402)
    expect(await declined.text()).toContain('Your card was declined.')

    // Testing docs: a decline is a card_error with code card_declined.
    const paymentIntent = await expectOpenAfterFailedPayment(stripe, session.id, 'card_declined')
    expect(paymentIntent.last_payment_error?.type).toBe('card_error')
    expect((await stripe.events.list({ type: 'payment_intent.payment_failed' })).data).toHaveLength(1)
    expect((await stripe.events.list({ type: 'checkout.session.completed' })).data).toHaveLength(0)

    const retry = await payWithCard(fake, session.id, CARD_SUCCEEDS)
    expect(retry.status).toBe(303)
    const after = await stripe.paymentIntents.retrieve(paymentIntent.id)
    expect(after.status).toBe('requires_capture')
    expect(after.last_payment_error).toBeNull()
  })

  it('4000 0025 0000 3155 asks the payer to confirm, then succeeds', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const session = await stripe.checkout.sessions.create(bookingSessionParams())

    const first = await payWithCard(fake, session.id, CARD_NEEDS_AUTHENTICATION)
    expect(first.status).toBe(303)
    expect(first.headers.get('location')).toBe(`/checkout/${session.id}`)
    const waiting = await stripe.checkout.sessions.retrieve(session.id, { expand: ['payment_intent'] })
    expect((waiting.payment_intent as Stripe.PaymentIntent).status).toBe('requires_action')
    const step = await (await fetch(`${fake.url}/checkout/${session.id}`)).text()
    expect(step).toContain('Confirm this payment')
    expect(step).toContain('3155')

    const confirmed = await submitCheckoutForm(fake, session.id, 'authenticate', { decision: 'confirm' })
    expect(confirmed.status).toBe(303)
    expect(confirmed.headers.get('location')).toBe(SUCCESS_URL.replace('{CHECKOUT_SESSION_ID}', session.id))
    const paymentIntent = await stripe.paymentIntents.retrieve((waiting.payment_intent as Stripe.PaymentIntent).id)
    expect(paymentIntent.status).toBe('requires_capture')
    expect(paymentIntent.amount_capturable).toBe(ESTIMATE_TOTAL_MINOR)
  })

  it('4000 0025 0000 3155 refused by the payer fails the payment and keeps the session open', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const session = await stripe.checkout.sessions.create(bookingSessionParams())
    await payWithCard(fake, session.id, CARD_NEEDS_AUTHENTICATION)

    const refused = await submitCheckoutForm(fake, session.id, 'authenticate', { decision: 'refuse' })
    expect(refused.status).toBe(402)
    expect(await refused.text()).toContain('unable to authenticate')
    await expectOpenAfterFailedPayment(stripe, session.id, 'payment_intent_authentication_failure')
  })

  it('any other card number gets a "use a test card" message and creates no payment', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const session = await stripe.checkout.sessions.create(bookingSessionParams())
    const response = await payWithCard(fake, session.id, '5105 1051 0510 5100')
    expect(response.status).toBe(422)
    const html = await response.text()
    expect(html).toContain('use one of the test card numbers')
    expect(html).toContain('aria-invalid="true"')
    expect((await stripe.checkout.sessions.retrieve(session.id)).payment_intent).toBeNull()
  })

  it('rejects an expired card date and a missing security code', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const session = await stripe.checkout.sessions.create(bookingSessionParams())
    const response = await submitCheckoutForm(fake, session.id, 'pay', { number: CARD_SUCCEEDS, expiry: '01/20', cvc: '' })
    expect(response.status).toBe(422)
    const html = await response.text()
    expect(html).toContain('field-expiry-error')
    expect(html).toContain('field-cvc-error')
  })

  it('cancel returns to cancel_url with 303 and leaves the session open', async () => {
    const { fake, stripe } = await startFakeWithSdk()
    const session = await stripe.checkout.sessions.create(bookingSessionParams())
    const response = await submitCheckoutForm(fake, session.id, 'cancel')
    expect(response.status).toBe(303)
    expect(response.headers.get('location')).toBe(session.cancel_url)
    expect((await stripe.checkout.sessions.retrieve(session.id)).status).toBe('open')
  })
})
