// A cutter goes out of service: the members booked on it in the period are told at once (the mail is written with
// the change), their bookings called off and their card holds released, new times offered, and the period refused.
import { beforeAll, describe, expect, it } from 'vitest'
import { describeLocal } from '../../server/services/workshop-time'
import { client, DEMO_PASSWORD, linkToken, signedIn, sqlRows, uniqueEmail, waitForMail } from './helpers'
import { payCheckout, waitForPaymentState } from './payment-helpers'
import { bookingBench, type BookingBench, type Client } from './workshop-setup'

let bench: BookingBench
let member: Client
let memberEmail: string

const query = <T>(sql: string, ...params: unknown[]) => sqlRows<T>(sql, params)

/** A member of their own, signed off on the bench cutter, so no other test's bookings count against their weekly limit. */
async function freshMember(prefix: string): Promise<{ member: Client; email: string }> {
  const email = uniqueEmail(prefix)
  await client().post('/api/auth/sign-up', { name: 'Wendeline Asquorth', email, password: DEMO_PASSWORD })
  expect((await client().post('/api/auth/verify', { token: linkToken(await waitForMail(email, /Confirm your e-mail/), '/verify') })).status).toBe(200)
  const members = (await bench.staff.get('/api/staff/members')).body as { id: number; email: string }[]
  const userId = members.find((m) => m.email === email)!.id
  expect((await bench.staff.post('/api/sign-offs', { userId, cutterId: bench.cutterId, signedOffOn: '2026-01-05' })).status).toBe(201)
  return { member: await signedIn(email), email }
}

async function book(title: string, start: string, pay: boolean): Promise<{ jobId: number; bookingId: number; authorisedMinor: number }> {
  const jobId = await bench.approvedJob(title, member)
  const booking = await member.post('/api/bookings', { jobId, cutterId: bench.cutterId, start })
  expect(booking.status, JSON.stringify(booking.body)).toBe(201)
  if (pay) {
    await payCheckout(booking.body.checkoutUrl)
    await waitForPaymentState(member, booking.body.id, 'authorised')
  }
  return { jobId, bookingId: booking.body.id, authorisedMinor: booking.body.authorisedMinor }
}

beforeAll(async () => {
  bench = await bookingBench()
  ;({ member, email: memberEmail } = await freshMember('outage'))
})

describe('a cutter out of service', () => {
  it('calls off the bookings in the period, mails each member at once with new times, releases the holds and refuses the period', async () => {
    const paid = await book('Outage: paid bracket', bench.at(6, '09:00'), true)
    const unpaid = await book('Outage: unpaid bracket', bench.at(6, '11:00'), false)
    const later = await book('Outage: after the repair', bench.at(8, '09:00'), true)
    const period = { start: bench.at(6, '08:00'), end: bench.at(7, '20:00') }

    const marked = await bench.staff.post('/api/outages', { cutterId: bench.cutterId, reason: 'Laser tube cracked', start: period.start, expectedBackAt: period.end })
    expect(marked.status, JSON.stringify(marked.body)).toBe(201)
    expect(marked.body.calledOff.map((c: { bookingId: number }) => c.bookingId).sort()).toEqual([paid.bookingId, unpaid.bookingId].sort())
    expect(marked.body.calledOff.every((c: { holdReleased: boolean }) => c.holdReleased)).toBe(true)

    // Told at once: the mails were written in the change's transaction, before the answer came back.
    const outbox = await query<{ subject: string }>("select subject from mail_outbox where recipient = ? and subject like '%out of service%'", memberEmail)
    expect(outbox).toHaveLength(2)

    const bookings = await query<{ id: number; status: string; outage_id: number | null }>('select id, status, outage_id from bookings where id in (?, ?, ?) order by id', paid.bookingId, unpaid.bookingId, later.bookingId)
    expect(bookings.find((b) => b.id === paid.bookingId)).toMatchObject({ status: 'cancelled', outage_id: marked.body.outage.id })
    expect(bookings.find((b) => b.id === unpaid.bookingId)).toMatchObject({ status: 'cancelled', outage_id: marked.body.outage.id })
    expect(bookings.find((b) => b.id === later.bookingId)).toMatchObject({ status: 'confirmed', outage_id: null })
    expect((await member.get(`/api/jobs/${paid.jobId}`)).body.state).toBe('approved')

    // The paid hold is given back in full through the payment service; nothing is captured.
    const ledger = await query<{ kind: string; amount_minor: number }>('select kind, amount_minor from payment_ledger where booking_id = ? order by id', paid.bookingId)
    expect(ledger.map((r) => r.kind)).toEqual(['authorised', 'released'])
    expect(ledger[1]!.amount_minor).toBe(paid.authorisedMinor)
    expect((await waitForPaymentState(member, paid.bookingId, 'released')).capturedMinor).toBe(0)

    // The next free times skip the period; the mail offers them and cancels the event in the member's calendar.
    const plan = (await member.get(`/api/bookings/suggestions?jobId=${paid.jobId}`)).body as { slots: { start: string; end: string }[] }
    expect(plan.slots.length).toBeGreaterThan(0)
    for (const slot of plan.slots) expect(slot.end <= period.start || slot.start >= period.end, `${slot.start} outside the period`).toBe(true)
    const mail = await waitForMail(memberEmail, /out of service: your booking is called off/)
    expect(mail.text).toContain('Laser tube cracked')
    expect(mail.text).toMatch(/held on your card for it is released|not paid yet/)
    const zone = bench.zone
    expect(mail.text).toContain(describeLocal(plan.slots[0]!.start, zone))
    expect(mail.attachments[0]!.content).toContain('METHOD:CANCEL')

    // Booking and the calendar refuse the period.
    const refused = await member.post('/api/bookings', { jobId: paid.jobId, cutterId: bench.cutterId, start: bench.at(7, '10:00') })
    expect(refused.status).toBe(409)
    expect(refused.body.data.reason).toBe('out-of-service')
    const availability = (await member.get(`/api/catalog/cutters/${bench.cutterId}/availability?from=${encodeURIComponent(bench.at(6, '00:00'))}&to=${encodeURIComponent(bench.at(8, '00:00'))}`)).body
    expect(availability.closures).toContainEqual({ start: period.start, end: period.end, reason: 'out of service (Laser tube cracked)' })

    // The member's overview offers the called-off jobs again; the staff's lists the period.
    const home = (await member.get('/api/home/member')).body
    expect(home.calledOff.map((c: { jobId: number }) => c.jobId).sort()).toEqual([paid.jobId, unpaid.jobId].sort())
    const staffHome = (await bench.staff.get('/api/home/staff')).body
    expect(staffHome.outages.find((o: { id: number }) => o.id === marked.body.outage.id)).toMatchObject({ calledOffCount: 2, reason: 'Laser tube cracked' })

    // Taking an offered time books the job again (with a fresh payment), and the notice goes.
    const rebooked = await member.post('/api/bookings', { jobId: paid.jobId, cutterId: bench.cutterId, start: plan.slots[0]!.start })
    expect(rebooked.status).toBe(201)
    expect((await member.get('/api/home/member')).body.calledOff.map((c: { jobId: number }) => c.jobId)).toEqual([unpaid.jobId])
  })

  it('a longer period calls off what it now covers; back in service opens the time again', async () => {
    const covered = await book('Outage: caught by the extension', bench.at(10, '09:00'), true)
    const marked = await bench.staff.post('/api/outages', { cutterId: bench.cutterId, reason: 'Chiller leaking', start: bench.at(9, '08:00'), expectedBackAt: bench.at(9, '20:00') })
    expect(marked.body.calledOff).toEqual([])

    const extended = await bench.staff.patch(`/api/outages/${marked.body.outage.id}`, { expectedBackAt: bench.at(10, '20:00') })
    expect(extended.status).toBe(200)
    expect(extended.body.calledOff.map((c: { bookingId: number }) => c.bookingId)).toEqual([covered.bookingId])
    expect((await query<{ kind: string }>('select kind from payment_ledger where booking_id = ? order by id', covered.bookingId)).map((r) => r.kind)).toEqual(['authorised', 'released'])
    expect((await bench.staff.patch(`/api/outages/${marked.body.outage.id}`, { expectedBackAt: bench.at(-1, '20:00') })).status).toBe(400)

    const again = await member.post('/api/bookings', { jobId: covered.jobId, cutterId: bench.cutterId, start: bench.at(10, '10:00') })
    expect(again.body.data.reason).toBe('out-of-service')
    // Put back before the period began: it never starts, and its time is open again.
    expect((await bench.staff.post(`/api/outages/${marked.body.outage.id}/end`)).status).toBe(200)
    expect((await member.post('/api/bookings', { jobId: covered.jobId, cutterId: bench.cutterId, start: bench.at(10, '10:00') })).status).toBe(201)
    expect((await bench.staff.get('/api/outages')).body.map((o: { id: number }) => o.id)).not.toContain(marked.body.outage.id)
  })

  it('refuses a return before the start, and members may not mark a cutter down', async () => {
    const backwards = await bench.staff.post('/api/outages', { cutterId: bench.cutterId, reason: 'Lens', start: bench.at(12, '10:00'), expectedBackAt: bench.at(12, '09:00') })
    expect(backwards.status).toBe(400)
    expect(backwards.body.data.fields.expectedBackAt).toBeTruthy()
    expect((await member.post('/api/outages', { cutterId: bench.cutterId, reason: 'x', expectedBackAt: bench.at(12, '09:00') })).status).toBe(403)
  })
})
