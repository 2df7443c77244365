import Stripe from 'stripe'
import { beforeAll, describe, expect, inject, it } from 'vitest'
import { stripeSignatureHeader } from '../../scripts/lib/stripe-fake/index'
import { plainPart } from '../fixtures/svg'
import { CARD_ASKS_TO_CONFIRM, CARD_DECLINED, countMail, payCheckout, settle, waitForPaymentState } from './payment-helpers'
import { inZone } from '../../server/services/workshop-time'
import { signedIn, sqlRows, waitForMail } from './helpers'
import { bookingBench, type BookingBench } from './workshop-setup'

let bench: BookingBench
let day = 13

beforeAll(async () => {
  bench = await bookingBench()
})

function ledger(bookingId: number): Promise<{ kind: string; amount_minor: number }[]> {
  return sqlRows('select kind, amount_minor from payment_ledger where booking_id = ? order by id', [bookingId])
}

async function bookedJob(title: string, start = bench.at(day++, '09:00')) {
  const jobId = await bench.approvedJob(title)
  const booking = await bench.member.post('/api/bookings', { jobId, cutterId: bench.cutterId, start })
  expect(booking.status).toBe(201)
  return { jobId, booking: booking.body }
}

/** A job of many copies, approved, so its estimate is long enough to log fewer minutes against. */
async function bigApprovedJob(title: string, copies: number) {
  const job = await bench.member.post('/api/jobs', { title, cutterId: bench.cutterId, materialId: bench.materialId })
  const form = new FormData()
  form.set('file', new Blob([plainPart(40, 30)], { type: 'image/svg+xml' }), 'tile.svg')
  form.set('quantity', String(copies))
  await bench.member.form(`/api/jobs/${job.body.id}/files`, form)
  await bench.member.post(`/api/jobs/${job.body.id}/submit`, {})
  await bench.staff.post(`/api/jobs/${job.body.id}/approve`, {})
  return job.body.id as number
}

// Round half up once, at the end (server/services/money.ts).
const percentOf = (amount: number, percent: number) => Math.floor((amount * percent + 50) / 100)

describe('holding the estimate and charging the minutes used', () => {
  it('book → pay with 4242 → webhook → paid; 37 minutes logged are charged exactly', async () => {
    const jobId = await bigApprovedJob('Shingles, many', 240)
    const job = (await bench.member.get(`/api/jobs/${jobId}`)).body
    const estimate = job.estimate
    expect(estimate.billableMinutes).toBeGreaterThan(42)
    const created = await bench.member.post('/api/bookings', { jobId, cutterId: bench.cutterId, start: bench.at(day++, '08:00') })
    expect(created.status).toBe(201)
    const booking = created.body
    expect(booking.status).toBe('held')
    expect(booking.estimateMinor).toBe(estimate.totalPriceMinor)
    expect(booking.authorisedMinor).toBe(percentOf(estimate.totalPriceMinor, 120))

    // The redirect alone proves nothing; the webhook marks the booking paid.
    const redirect = await payCheckout(booking.checkoutUrl)
    expect(redirect.status).toBe(303)
    const paid = await waitForPaymentState(bench.member, booking.id, 'authorised')
    expect(paid.authorisedMinor).toBe(booking.authorisedMinor)
    await waitForMail('member@example.test', /Payment received/)

    // A booked job is withdrawn only after its booking is cancelled under the policy.
    const withdraw = await bench.member.post(`/api/jobs/${jobId}/withdraw`)
    expect(withdraw.status).toBe(409)
    expect(withdraw.body.message).toMatch(/Cancel the booking first/)

    expect((await bench.staff.post(`/api/jobs/${jobId}/start`)).status).toBe(200)
    // Once the cut has started the booking is the cut's record: no cancelling, no moving.
    expect((await bench.member.post(`/api/bookings/${booking.id}/cancel`, {})).status).toBe(409)
    expect((await bench.member.patch(`/api/bookings/${booking.id}`, { start: bench.at(day + 3, '09:00') })).status).toBe(409)
    const finished = await bench.staff.post(`/api/jobs/${jobId}/finish`, { actualMinutes: 37 })
    expect(finished.status).toBe(200)
    // Bench cutter: 100 per minute, 5 setup minutes, billed per minute; material is the job's sheets.
    const expected = (37 + 5) * 100 + estimate.materialPriceMinor
    expect(finished.body.chargeMinor).toBe(expected)
    expect(finished.body.capturedMinor).toBe(expected)
    expect(finished.body.balanceMinor).toBe(0)
    const settled = await waitForPaymentState(bench.member, booking.id, 'captured')
    expect(settled.capturedMinor).toBe(expected)
    expect((await ledger(booking.id)).map((r) => r.kind)).toEqual(['authorised', 'captured'])
    expect((await waitForMail('member@example.test', /Receipt for your cut/)).text).toContain('37 machine minutes used')

    // A staff refund after capture, with a reason; never more than is left.
    const tooMuch = await bench.staff.post(`/api/payments/${booking.id}/refund`, { amountMinor: expected + 1, reason: 'Typo' })
    expect(tooMuch.status).toBe(400)
    const refund = await bench.staff.post(`/api/payments/${booking.id}/refund`, { amountMinor: 500, reason: 'Two panels re-cut for a machine fault' })
    expect(refund.status).toBe(200)
    expect((await waitForPaymentState(bench.member, booking.id, 'partly-refunded')).refundedMinor).toBe(500)
    expect((await waitForMail('member@example.test', /Refund on its way/)).text).toContain('machine fault')
    expect((await bench.member.post(`/api/payments/${booking.id}/refund`, { reason: 'me too' })).status).toBe(403)
  })

  it('captures the hold and asks for the rest: the debt shows on payments, job page and run sheet, and a second checkout pays it', async () => {
    const { jobId, booking } = await bookedJob('Over the hold')
    await payCheckout(booking.checkoutUrl)
    await waitForPaymentState(bench.member, booking.id, 'authorised')
    await bench.staff.post(`/api/jobs/${jobId}/start`)
    const finished = (await bench.staff.post(`/api/jobs/${jobId}/finish`, { actualMinutes: 90 })).body
    expect(finished.capturedMinor).toBe(booking.authorisedMinor)
    expect(finished.balanceMinor).toBe(finished.chargeMinor - booking.authorisedMinor)
    expect(finished.balanceUrl).toMatch(/\/checkout\//)
    const owing = await waitForPaymentState(bench.member, booking.id, 'balance-due')
    expect(owing.capturedMinor).toBe(booking.authorisedMinor)
    expect(owing.balanceMinor).toBe(finished.balanceMinor)
    // The ledger's note reads as money, not as raw minor units.
    const owedEvent = owing.events.find((e: { kind: string }) => e.kind === 'owed')
    expect(owedEvent.note).toContain(`€${(booking.authorisedMinor / 100).toFixed(2)}`)
    // The member is told by mail, with the amount as money and the way to pay it.
    const owedMail = await waitForMail('member@example.test', /Balance to pay for your cut/)
    expect(owedMail.text).toContain(`€${(finished.balanceMinor / 100).toFixed(2)} is still to pay`)
    expect(owedMail.text).toContain('/payments')
    expect((await bench.member.get(`/api/jobs/${jobId}`)).body.balanceOwed).toMatchObject({ bookingId: booking.id, balanceMinor: finished.balanceMinor, currency: 'EUR' })
    const date = inZone(booking.starts_at, bench.zone).toISODate()
    const entry = (await bench.staff.get(`/api/run-sheet?cutter=${bench.cutterId}&date=${date}`)).body.entries.find((e: { job: { id: number } }) => e.job.id === jobId)
    expect(entry.balanceOwed).toEqual({ bookingId: booking.id, balanceMinor: finished.balanceMinor, currency: 'EUR' })

    // The member's pay button opens the same open checkout twice; another member is not told the booking exists.
    const opened = await bench.member.post(`/api/payments/${booking.id}/balance`)
    expect(opened.status).toBe(200)
    expect(opened.body).toMatchObject({ url: finished.balanceUrl, balanceMinor: finished.balanceMinor })
    expect((await bench.member.post(`/api/payments/${booking.id}/balance`)).body.url).toBe(opened.body.url)
    expect((await (await signedIn('ines@example.test')).post(`/api/payments/${booking.id}/balance`)).status).toBe(404)

    // Handing the parts over while money is owed waits for staff to confirm it.
    await bench.staff.post(`/api/jobs/${jobId}/ready`, { location: 'Shelf B' })
    const code = (await bench.member.get(`/api/jobs/${jobId}/pickup`)).body.code
    const refused = await bench.staff.post('/api/pickups/collect', { code })
    expect(refused.status).toBe(409)
    expect(refused.body.data).toMatchObject({ reason: 'balance-owed', balanceMinor: finished.balanceMinor })
    expect((await bench.member.get(`/api/jobs/${jobId}`)).body.state).toBe('ready')
    expect((await bench.staff.post('/api/pickups/collect', { code, handOverWithBalanceOwed: true })).status).toBe(200)

    // Paying the second checkout settles it, once.
    await payCheckout(opened.body.url)
    const paid = await waitForPaymentState(bench.member, booking.id, 'captured')
    expect(paid.balanceMinor).toBe(0)
    expect(paid.capturedMinor).toBe(finished.chargeMinor)
    expect((await bench.member.get(`/api/jobs/${jobId}`)).body.balanceOwed).toBeNull()
    expect((await bench.member.post(`/api/payments/${booking.id}/balance`)).status).toBe(409)
  })

  it('free cancellation releases the hold and charges nothing', async () => {
    const { booking } = await bookedJob('Cancel early')
    await payCheckout(booking.checkoutUrl)
    await waitForPaymentState(bench.member, booking.id, 'authorised')
    const cancelled = await bench.member.post(`/api/bookings/${booking.id}/cancel`, {})
    expect(cancelled.body.feeMinor).toBe(0)
    const released = await waitForPaymentState(bench.member, booking.id, 'released')
    expect(released.capturedMinor).toBe(0)
  })

  it('late cancellation captures only the fee', async () => {
    // Tomorrow morning: inside any free-cancellation window of two weeks.
    const { booking } = await bookedJob('Cancel late', bench.at(1, '11:00'))
    await payCheckout(booking.checkoutUrl, CARD_ASKS_TO_CONFIRM)
    await waitForPaymentState(bench.member, booking.id, 'authorised')
    await bench.admin.patch('/api/admin/settings', { freeCancellationHours: 336 })
    try {
      const cancelled = await bench.member.post(`/api/bookings/${booking.id}/cancel`, {})
      expect(cancelled.body.feeMinor).toBe(percentOf(booking.estimateMinor, 50))
      const state = await waitForPaymentState(bench.member, booking.id, 'captured')
      expect(state.capturedMinor).toBe(percentOf(booking.estimateMinor, 50))
      expect((await ledger(booking.id)).map((r) => r.kind)).toEqual(['authorised', 'fee'])
    } finally {
      await bench.admin.patch('/api/admin/settings', { freeCancellationHours: 24 })
    }
  })

  it('a cancel and a start at the same moment: exactly one wins, and the money agrees with the state', async () => {
    const outcomes: string[] = []
    for (let i = 0; i < 6; i++) {
      const { jobId, booking } = await bookedJob(`Race ${i}`)
      await payCheckout(booking.checkoutUrl)
      await waitForPaymentState(bench.member, booking.id, 'authorised')
      const [cancel, start] = await Promise.all([bench.member.post(`/api/bookings/${booking.id}/cancel`, {}), bench.staff.post(`/api/jobs/${jobId}/start`)])
      expect([cancel.status, start.status].sort()).toEqual([200, 409])
      const state = (await bench.member.get(`/api/jobs/${jobId}`)).body.state
      if (start.status === 200) {
        outcomes.push('started')
        expect(state).toBe('cutting')
        expect((await waitForPaymentState(bench.member, booking.id, 'authorised')).authorisedMinor).toBe(booking.authorisedMinor)
        expect((await bench.staff.post(`/api/jobs/${jobId}/finish`, { actualMinutes: 3 })).status).toBe(200)
      } else {
        outcomes.push('cancelled')
        expect(state).toBe('approved')
        await waitForPaymentState(bench.member, booking.id, 'released')
      }
    }
    expect(outcomes).toHaveLength(6)
  })

  it('a declined card leaves the booking unpaid, and it is released after the hold', async () => {
    const { jobId, booking } = await bookedJob('Declined')
    const declined = await payCheckout(booking.checkoutUrl, CARD_DECLINED)
    expect(declined.status).toBeLessThan(500)
    await new Promise((r) => setTimeout(r, 300))
    expect(await ledger(booking.id)).toEqual([])
    await sqlRows("update bookings set hold_expires_at = '2000-01-01T00:00:00.000Z' where id = ?", [booking.id])
    expect((await bench.admin.post('/api/admin/tasks/release-holds')).body.released).toBeGreaterThanOrEqual(1)
    expect((await bench.member.get(`/api/jobs/${jobId}`)).body.state).toBe('approved')
    // No hold ever existed, so nothing is "released" either.
    await new Promise((r) => setTimeout(r, 300))
    expect(await ledger(booking.id)).toEqual([])
  })
})

describe('webhooks', () => {
  const stripe = () => {
    const base = new URL(inject('stripeFakeUrl'))
    return new Stripe('sk_test_kerfbook_tests', { host: base.hostname, port: Number(base.port), protocol: 'http' })
  }
  const post = (payload: string, signature: string) => fetch(`${inject('baseUrl')}/api/webhooks/stripe`, { method: 'POST', headers: { 'content-type': 'application/json', 'stripe-signature': signature }, body: payload })

  it('refuses unsigned, badly signed and stale events and changes nothing', async () => {
    const { booking } = await bookedJob('Forged')
    const forged = JSON.stringify({ id: 'evt_forged', object: 'event', type: 'payment_intent.succeeded', data: { object: { object: 'payment_intent', id: 'pi_forged', metadata: { bookingId: String(booking.id) } } } })
    expect((await post(forged, 't=1,v1=deadbeef')).status).toBe(400)
    expect((await fetch(`${inject('baseUrl')}/api/webhooks/stripe`, { method: 'POST', body: forged })).status).toBe(400)
    const stale = Math.floor(Date.now() / 1000) - 600
    expect((await post(forged, stripeSignatureHeader(forged, inject('stripeWebhookSecret'), stale))).status).toBe(400)
    expect(await ledger(booking.id)).toEqual([])
  })

  it('counts an event delivered ten times once', async () => {
    const { booking } = await bookedJob('Replayed')
    await payCheckout(booking.checkoutUrl)
    await waitForPaymentState(bench.member, booking.id, 'authorised')
    const events = await stripe().events.list({ type: 'checkout.session.completed', limit: 20 })
    const event = events.data.find((e) => (e.data.object as Stripe.Checkout.Session).metadata?.bookingId === String(booking.id))!
    const payload = JSON.stringify(event)
    for (let i = 0; i < 10; i++) {
      const response = await post(payload, stripeSignatureHeader(payload, inject('stripeWebhookSecret'), Math.floor(Date.now() / 1000)))
      expect(response.status).toBe(200)
    }
    expect(await ledger(booking.id)).toHaveLength(1)
  })

  it('mails each money event once: one "Payment received", one receipt, and nothing for ten replays', async () => {
    const member = 'member@example.test'
    const received = /Payment received/
    const receipt = /Receipt for your cut/
    // Mails of the tests before still on their way must not count here.
    await settle()
    const before = { received: await countMail(member, received), receipt: await countMail(member, receipt) }
    const { jobId, booking } = await bookedJob('Mailed once')
    await payCheckout(booking.checkoutUrl)
    await waitForPaymentState(bench.member, booking.id, 'authorised')
    await settle()
    expect(await countMail(member, received)).toBe(before.received + 1)

    await bench.staff.post(`/api/jobs/${jobId}/start`)
    expect((await bench.staff.post(`/api/jobs/${jobId}/finish`, { actualMinutes: 3 })).status).toBe(200)
    await waitForPaymentState(bench.member, booking.id, 'captured')
    await settle()
    expect(await countMail(member, receipt)).toBe(before.receipt + 1)
    expect(await countMail(member, received)).toBe(before.received + 1)

    // Every event Stripe sent about this booking, delivered again ten times: the ledger and the mailbox stay as they are.
    const all = await countMail(member, /./)
    const events = (await stripe().events.list({ limit: 100 })).data.filter(
      (e) => (e.data.object as { metadata?: Record<string, string> }).metadata?.bookingId === String(booking.id),
    )
    expect(events.length).toBeGreaterThanOrEqual(3)
    for (let i = 0; i < 10; i++) {
      for (const event of events) {
        const payload = JSON.stringify(event)
        expect((await post(payload, stripeSignatureHeader(payload, inject('stripeWebhookSecret'), Math.floor(Date.now() / 1000)))).status).toBe(200)
      }
    }
    await settle()
    expect(await countMail(member, /./)).toBe(all)
    expect((await ledger(booking.id)).map((r) => r.kind)).toEqual(['authorised', 'captured'])
  })
})
