import { createServer, type Server } from 'node:http'
import type { AddressInfo } from 'node:net'
import Stripe from 'stripe'
import { afterEach, describe, expect, it } from 'vitest'
import { heldPayment, startFakeWithSdk } from './helpers'

const WEBHOOK_SECRET = 'whsec_kerfbook_unit_test_secret'

interface ReceivedWebhook {
  body: string
  eventId: string
  signature: string
}

const receivers: Server[] = []
afterEach(async () => {
  await Promise.all(receivers.splice(0).map((server) => new Promise<void>((resolve) => server.close(() => resolve()))))
})

/** A stand-in for the app's webhook route on 127.0.0.1; it answers 500 to the first `failuresPerEvent` tries of each event. */
async function startReceiver(failuresPerEvent = 0): Promise<{ url: string; received: ReceivedWebhook[] }> {
  const received: ReceivedWebhook[] = []
  const server = createServer((request, response) => {
    const chunks: Buffer[] = []
    request.on('data', (chunk: Buffer) => chunks.push(chunk))
    request.on('end', () => {
      const body = Buffer.concat(chunks).toString('utf8')
      const eventId = (JSON.parse(body) as Stripe.Event).id
      const earlierTries = received.filter((webhook) => webhook.eventId === eventId).length
      received.push({ body, eventId, signature: String(request.headers['stripe-signature']) })
      response.writeHead(earlierTries < failuresPerEvent ? 500 : 200).end()
    })
  })
  receivers.push(server)
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', () => resolve()))
  return { url: `http://127.0.0.1:${(server.address() as AddressInfo).port}/api/payments/webhook`, received }
}

describe('webhooks signed with the Stripe-Signature scheme', () => {
  it('sends every event, and the official SDK verifies each signature', async () => {
    const receiver = await startReceiver()
    const { fake, stripe } = await startFakeWithSdk({ webhook: { url: receiver.url, secret: WEBHOOK_SECRET } })
    const held = await heldPayment(fake, stripe)
    await stripe.paymentIntents.capture(held.id)
    await stripe.refunds.create({ payment_intent: held.id, amount: 100 })
    await fake.webhooksSettled()

    const verified = receiver.received.map(({ body, signature }) => stripe.webhooks.constructEvent(body, signature, WEBHOOK_SECRET))
    expect(verified.map((event) => event.type).sort()).toEqual(
      ['charge.refunded', 'checkout.session.completed', 'payment_intent.amount_capturable_updated', 'payment_intent.succeeded'].sort(),
    )
    const completed = verified.find((event) => event.type === 'checkout.session.completed')!
    expect((completed.data.object as Stripe.Checkout.Session).client_reference_id).toBe('bk_demo_17')
  })

  it('a tampered body or another secret fails verification', async () => {
    const receiver = await startReceiver()
    const { fake, stripe } = await startFakeWithSdk({ webhook: { url: receiver.url, secret: WEBHOOK_SECRET } })
    await heldPayment(fake, stripe)
    await fake.webhooksSettled()
    const { body, signature } = receiver.received[0]!

    expect(() => stripe.webhooks.constructEvent(body.replace('"livemode": false', '"livemode": true'), signature, WEBHOOK_SECRET)).toThrow(
      Stripe.errors.StripeSignatureVerificationError,
    )
    expect(() => stripe.webhooks.constructEvent(body, signature, 'whsec_some_other_endpoint')).toThrow(Stripe.errors.StripeSignatureVerificationError)
  })

  it('retries a delivery the endpoint did not accept', async () => {
    const receiver = await startReceiver(2)
    const { fake, stripe } = await startFakeWithSdk({ webhook: { url: receiver.url, secret: WEBHOOK_SECRET, retryDelaysMs: [10, 10, 10] } })
    await heldPayment(fake, stripe)
    await fake.webhooksSettled()

    expect(fake.webhookDeliveries.length).toBeGreaterThan(0)
    for (const delivery of fake.webhookDeliveries) {
      expect(delivery).toMatchObject({ attempts: 3, lastResult: 200, delivered: true })
      expect(receiver.received.filter((webhook) => webhook.eventId === delivery.eventId)).toHaveLength(3)
      // Once delivered, the event no longer counts a pending webhook.
      expect((await stripe.events.retrieve(delivery.eventId)).pending_webhooks).toBe(0)
    }
  })

  it('gives up after the last retry and leaves the event pending', async () => {
    const receiver = await startReceiver(10)
    const { fake, stripe } = await startFakeWithSdk({ webhook: { url: receiver.url, secret: WEBHOOK_SECRET, retryDelaysMs: [5] } })
    await heldPayment(fake, stripe)
    await fake.webhooksSettled()

    for (const delivery of fake.webhookDeliveries) {
      expect(delivery).toMatchObject({ attempts: 2, lastResult: 500, delivered: false })
      expect((await stripe.events.retrieve(delivery.eventId)).pending_webhooks).toBe(1)
    }
  })

  it('sends to loopback addresses only', async () => {
    await expect(startFakeWithSdk({ webhook: { url: 'http://192.0.2.10/webhook', secret: WEBHOOK_SECRET } })).rejects.toThrow(/loopback/)
  })
})
