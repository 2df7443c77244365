// A server killed between the card's capture and the finish's commit: this file starts a server of its own (the built
// app) whose Stripe calls pass through a relay the test controls. The relay lets a capture reach the Stripe fake and
// then holds its answer, so the capture happens and the app never hears of it; the test then kills the app (SIGKILL)
// and starts it again on the same database. What the app wrote before the capture is all it has to go on.
import { createServer, request as httpRequest, type IncomingMessage, type Server, type ServerResponse } from 'node:http'
import Stripe from 'stripe'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { startBuiltApp, type BuiltApp } from '../../scripts/lib/built-app'
import { freePort } from '../../scripts/lib/free-port'
import { waitForPaymentState } from './payment-helpers'
import { bookingBench, type BookingBench } from './workshop-setup'
import { sqlRow } from './helpers'

let app: BuiltApp
let relay: Server
let stripeFakeUrl = ''
/** Captures whose answers the relay holds back, by PaymentIntent id; resolved once the fake has captured. */
const heldCaptures = new Map<string, () => void>()
const heldAnswers: ServerResponse[] = []

function relayRequest(incoming: IncomingMessage, answer: ServerResponse) {
  const target = new URL(incoming.url!, stripeFakeUrl)
  const outgoing = httpRequest(target, { method: incoming.method, headers: { ...incoming.headers, host: target.host } }, (response) => {
    const capture = incoming.method === 'POST' ? /^\/v1\/payment_intents\/([^/]+)\/capture$/.exec(target.pathname) : null
    const captured = capture ? heldCaptures.get(capture[1]!) : undefined
    if (captured && response.statusCode === 200) {
      // Captured at the fake; the app waits for an answer that never comes.
      response.resume()
      response.on('end', captured)
      heldAnswers.push(answer)
      return
    }
    answer.writeHead(response.statusCode!, response.headers)
    response.pipe(answer)
  })
  incoming.pipe(outgoing)
}

beforeAll(async () => {
  const port = await freePort()
  relay = createServer(relayRequest)
  await new Promise<void>((resolve) => relay.listen(port, '127.0.0.1', resolve))
  app = await startBuiltApp({ name: 'kerfbook-payment-crash', postgresUrl: inject('postgresUrl'), env: { STRIPE_API_BASE: `http://127.0.0.1:${port}`, TRUST_PROXY: '1' } })
  stripeFakeUrl = app.stripeFakeUrl
})

afterAll(async () => {
  for (const answer of heldAnswers) answer.destroy()
  await new Promise((resolve) => relay?.close(resolve))
  await app?.stop()
})

async function row<T>(sql: string, ...params: unknown[]): Promise<T> {
  return (await sqlRow<T>(sql, params, app.databaseLocation))!
}

/** Pays the fake's hosted checkout with the card that authorises. */
async function pay(checkoutUrl: string) {
  const response = await fetch(`${checkoutUrl}/pay`, {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({ number: '4242424242424242', expiry: '12 / 34', cvc: '123', name: 'Juno Castellane' }),
    redirect: 'manual',
  })
  expect(response.status).toBe(303)
}

async function onTheMachine(bench: BookingBench, title: string, day: number) {
  const jobId = await bench.approvedJob(title)
  const booking = (await bench.member.post('/api/bookings', { jobId, cutterId: bench.cutterId, start: bench.at(day, '09:00') })).body
  await pay(booking.checkoutUrl)
  await waitForPaymentState(bench.member, booking.id, 'authorised')
  expect((await bench.staff.post(`/api/jobs/${jobId}/start`)).status).toBe(200)
  const intentId = (await row<{ payment_intent_id: string }>('select payment_intent_id from bookings where id = ?', booking.id)).payment_intent_id
  return { jobId, bookingId: booking.id as number, intentId }
}

describe('a finish whose server dies between the capture and the commit', () => {
  it('is completed after the restart: by a retry with other minutes, or by the reconcile duty', async () => {
    const bench = await bookingBench(app.baseUrl)
    const retried = await onTheMachine(bench, 'Killed mid-finish, retried', 3)
    const reconciled = await onTheMachine(bench, 'Killed mid-finish, reconciled', 4)

    // Both finishes reach Stripe, which captures; neither hears back before the server is killed.
    const capturedAtStripe = [retried, reconciled].map((cut) => new Promise<void>((resolve) => heldCaptures.set(cut.intentId, resolve)))
    const quote = (await bench.staff.get(`/api/jobs/${retried.jobId}/finish-quote?actualMinutes=2`)).body
    const finishes = [retried, reconciled].map((cut) => bench.staff.post(`/api/jobs/${cut.jobId}/finish`, { actualMinutes: 2 }).catch((error: Error) => error))
    await Promise.all(capturedAtStripe)
    await app.restartAfterCrash()
    for (const finish of await Promise.all(finishes)) expect(finish).toBeInstanceOf(Error)
    heldCaptures.clear()

    const stripe = new Stripe('sk_test_kerfbook_tests', { host: '127.0.0.1', port: Number(new URL(stripeFakeUrl).port), protocol: 'http' })
    for (const cut of [retried, reconciled]) {
      expect((await stripe.paymentIntents.retrieve(cut.intentId)).amount_received).toBe(quote.captureMinor)
      // All the server kept: the job still on the machine, with the finish it had noted before the capture.
      expect(await row('select state, finishing_minutes, actual_minutes from jobs where id = ?', cut.jobId)).toEqual({ state: 'cutting', finishing_minutes: 2, actual_minutes: null })
    }

    // Staff try again with fewer minutes: no 502 (no second capture), and what was captured beyond goes back to the card.
    const again = await bench.staff.post(`/api/jobs/${retried.jobId}/finish`, { actualMinutes: 1 })
    expect(again.status).toBe(200)
    expect(again.body.chargeMinor).toBe(quote.chargeMinor - 100)
    expect(await row('select state, actual_minutes, finishing_since from jobs where id = ?', retried.jobId)).toEqual({ state: 'cut', actual_minutes: 1, finishing_since: null })
    const refunded = await waitForPaymentState(bench.member, retried.bookingId, 'partly-refunded')
    expect(refunded.capturedMinor - refunded.refundedMinor).toBe(again.body.chargeMinor)

    // Nobody touches the other one: the reconcile duty finds its captured PaymentIntent and commits the noted finish.
    expect((await bench.admin.post('/api/admin/tasks/reconcile-payments')).body.finished).toBe(1)
    expect(await row('select state, actual_minutes, finishing_since from jobs where id = ?', reconciled.jobId)).toEqual({ state: 'cut', actual_minutes: 2, finishing_since: null })
    expect((await waitForPaymentState(bench.member, reconciled.bookingId, 'captured')).capturedMinor).toBe(quote.chargeMinor)
    expect((await bench.admin.post('/api/admin/tasks/reconcile-payments')).body.finished).toBe(0)
  })
})
