// The desk's early answers: whether a member holds the sign-off booking will ask for (told on the job
// and the booking plan, to the member and the staff), what a suggested slot would cost to cancel, and
// which cutter the run sheet opens on.
import { beforeAll, describe, expect, it } from 'vitest'
import { client, linkToken, signedIn, uniqueEmail, waitForMail } from './helpers'
import { slitPair } from '../fixtures/svg'
import { payCheckout, waitForPaymentState } from './payment-helpers'
import { bookingBench, type BookingBench, type Client } from './workshop-setup'

let bench: BookingBench

beforeAll(async () => {
  bench = await bookingBench()
})

/** A member who just joined: confirmed e-mail, no sign-off on any cutter. */
async function newMember(): Promise<{ member: Client; id: number; email: string }> {
  const email = uniqueEmail('no-sign-off')
  await client().post('/api/auth/sign-up', { name: 'Perpetua Vashti-Oyelowo', email, password: 'long-enough-pass' })
  await client().post('/api/auth/verify', { token: linkToken(await waitForMail(email, /Confirm your e-mail/), '/verify') })
  const member = await signedIn(email, 'long-enough-pass')
  return { member, id: (await member.get('/api/me')).body.id, email }
}

describe('sign-offs, said early', () => {
  it('tells the member on the job and the staff at approval that the cutter’s sign-off is missing, until it is recorded', async () => {
    const { member, id } = await newMember()
    const created = await member.post('/api/jobs', { title: 'Unsigned lantern', cutterId: bench.cutterId, materialId: bench.materialId })
    expect(created.status).toBe(201)
    const jobId = created.body.id as number
    expect((await member.get(`/api/jobs/${jobId}`)).body.memberSignedOff).toBe(false)
    // The new-job form reads the member's own sign-offs: none is valid for this cutter.
    expect(((await member.get('/api/me/sign-offs')).body as { cutterId: number; valid: boolean }[]).some((s) => s.cutterId === bench.cutterId && s.valid)).toBe(false)

    const approvedId = await bench.approvedJob('Unsigned panels', member)
    // The staff see it on the job they approved, and the booking plan says it before "Book and pay".
    expect((await bench.staff.get(`/api/jobs/${approvedId}`)).body.memberSignedOff).toBe(false)
    expect((await member.get(`/api/bookings/suggestions?jobId=${approvedId}`)).body.memberSignedOff).toBe(false)
    // What the flag foretells is what booking answers.
    const refused = await member.post('/api/bookings', { jobId: approvedId, cutterId: bench.cutterId, start: bench.at(3, '10:00') })
    expect(refused.status).toBe(409)
    expect(refused.body.data.reason).toBe('no-sign-off')

    expect((await bench.staff.post('/api/sign-offs', { userId: id, cutterId: bench.cutterId, signedOffOn: '2026-01-05' })).status).toBe(201)
    expect((await member.get(`/api/jobs/${jobId}`)).body.memberSignedOff).toBe(true)
    expect((await bench.staff.get(`/api/jobs/${approvedId}`)).body.memberSignedOff).toBe(true)
    expect((await member.get(`/api/bookings/suggestions?jobId=${approvedId}`)).body.memberSignedOff).toBe(true)
  })
})

describe('the booking plan', () => {
  it('marks a slot already inside the late-cancellation window, and its fee is what cancelling then charges', async () => {
    const jobId = await bench.approvedJob('Late window')
    const plan = (await bench.member.get(`/api/bookings/suggestions?jobId=${jobId}`)).body
    expect(plan).toMatchObject({ jobId, cutterId: bench.cutterId, memberSignedOff: true })
    const settings = (await bench.member.get('/api/settings')).body
    // The slots are the next free ones: the first starts within the day, so inside any window of a day or more.
    const slot = plan.slots[0]
    expect(slot.late).toBe(Date.parse(slot.start) - settings.freeCancellationHours * 3_600_000 < Date.now())
    expect(plan.cancellation).toMatchObject({ freeHours: settings.freeCancellationHours, feePercent: settings.lateCancellationFeePercent })

    const booking = (await bench.member.post('/api/bookings', { jobId, cutterId: bench.cutterId, start: slot.start })).body
    expect((await bench.member.get(`/api/bookings/${booking.id}/cancellation-terms`)).body.late).toBe(slot.late)
    await payCheckout(booking.checkoutUrl)
    await waitForPaymentState(bench.member, booking.id, 'authorised')
    const cancelled = await bench.member.post(`/api/bookings/${booking.id}/cancel`, {})
    expect(cancelled.status).toBe(200)
    expect(cancelled.body.feeMinor).toBe(slot.late ? plan.cancellation.lateFeeMinor : 0)
  })
})

describe('the run sheet’s cutter', () => {
  it('opens a day on the cutter booked that day, unless the cutter chosen last has bookings too', async () => {
    // A day no cutter is booked on yet (other test files book their own cutters on days of their own).
    let day = 26
    const dateOf = (offset: number) => new Intl.DateTimeFormat('en-CA', { timeZone: bench.zone }).format(new Date(bench.at(offset, '12:00')))
    while (((await bench.staff.get(`/api/run-sheet?date=${dateOf(day)}`)).body.cutters as { bookings: number }[]).some((c) => c.bookings > 0)) day--
    const localDate = dateOf(day)
    const jobId = await bench.approvedJob('Run sheet default')
    expect((await bench.member.post('/api/bookings', { jobId, cutterId: bench.cutterId, start: bench.at(day, '10:00') })).status).toBe(201)
    const opened = (await bench.staff.get(`/api/run-sheet?date=${localDate}`)).body
    expect(opened.cutterId).toBe(bench.cutterId)
    expect(opened.entries.map((e: { job: { id: number } }) => e.job.id)).toContain(jobId)
    expect(opened.cutters.find((c: { id: number }) => c.id === bench.cutterId).bookings).toBeGreaterThanOrEqual(1)

    // A remembered cutter with nothing booked that day gives way to the booked one; asked for by name, it is shown.
    const idle = opened.cutters.find((c: { id: number; bookings: number }) => c.bookings === 0)
    expect((await bench.staff.get(`/api/run-sheet?prefer=${idle.id}&date=${localDate}`)).body.cutterId).toBe(bench.cutterId)
    expect((await bench.staff.get(`/api/run-sheet?cutter=${idle.id}&date=${localDate}`)).body.cutterId).toBe(idle.id)
  })
})

describe('the run sheet at the machine', () => {
  it('shows the estimate, where the accepted warnings are, what was charged, and keeps the day’s collected jobs', async () => {
    const job = await bench.member.post('/api/jobs', { title: 'Slotted tray', cutterId: bench.cutterId, materialId: bench.materialId })
    const jobId = job.body.id as number
    const form = new FormData()
    // Two slits 1 mm apart along y = 15 and y = 16, x from 15 to 55: with the 0.2 mm kerf a bridge under the 3 mm minimum.
    form.set('file', new Blob([slitPair(1)], { type: 'image/svg+xml' }), 'tray.svg')
    await bench.member.form(`/api/jobs/${jobId}/files`, form)
    expect((await bench.member.post(`/api/jobs/${jobId}/submit`, { acknowledgement: 'The thin web is a living hinge.' })).status).toBe(200)
    expect((await bench.staff.post(`/api/jobs/${jobId}/approve`, {})).status).toBe(200)
    const start = bench.at(23, '10:00')
    const booking = (await bench.member.post('/api/bookings', { jobId, cutterId: bench.cutterId, start })).body
    await payCheckout(booking.checkoutUrl)
    await waitForPaymentState(bench.member, booking.id, 'authorised')
    const date = new Intl.DateTimeFormat('en-CA', { timeZone: bench.zone }).format(new Date(start))
    const sheetUrl = `/api/run-sheet?cutter=${bench.cutterId}&date=${date}`
    const entryOf = async () => (await bench.staff.get(sheetUrl)).body.entries.find((e: { job: { id: number } }) => e.job.id === jobId)

    const before = await entryOf()
    const detail = (await bench.staff.get(`/api/jobs/${jobId}`)).body
    const cutter = (await bench.staff.get(`/api/catalog/cutters/${bench.cutterId}`)).body
    // The estimate beside the timer is the machine time without the one setup.
    expect(before.estimateMinutes).toBeCloseTo(detail.estimate.machineS / 60 - cutter.setupMinutes, 1)
    expect(before.chargedMinor).toBeNull()
    const [group] = before.warningGroups
    expect(group.acknowledgement.reason).toBe('The thin web is a living hinge.')
    expect(group.locations.length).toBeGreaterThan(0)
    for (const place of group.locations) {
      // Between the two slits of the drawing (the fixture's own coordinates).
      expect(place.x).toBeGreaterThanOrEqual(15 - 1e-3)
      expect(place.x).toBeLessThanOrEqual(55 + 1e-3)
      expect(place.y).toBeGreaterThanOrEqual(15 - 1e-3)
      expect(place.y).toBeLessThanOrEqual(16 + 1e-3)
    }

    expect((await bench.staff.post(`/api/jobs/${jobId}/start`)).status).toBe(200)
    const quote = (await bench.staff.get(`/api/jobs/${jobId}/finish-quote?actualMinutes=3`)).body
    const finished = await bench.staff.post(`/api/jobs/${jobId}/finish`, { actualMinutes: 3, confirmedChargeMinor: quote.chargeMinor })
    expect(finished.status).toBe(200)
    await waitForPaymentState(bench.member, booking.id, 'captured')
    const cut = await entryOf()
    expect(cut.job.state).toBe('cut')
    expect(cut.chargedMinor).toBe(finished.body.capturedMinor)

    expect((await bench.staff.post(`/api/jobs/${jobId}/ready`, { location: 'Shelf D' })).status).toBe(200)
    const { code } = (await bench.member.get(`/api/jobs/${jobId}/pickup`)).body
    expect((await bench.staff.post('/api/pickups/collect', { code })).status).toBe(200)
    const day = (await bench.staff.get(sheetUrl)).body
    expect(day.entries.some((e: { job: { id: number } }) => e.job.id === jobId)).toBe(false)
    expect(day.collected.find((e: { job: { id: number } }) => e.job.id === jobId)).toMatchObject({ job: { state: 'collected' }, chargedMinor: finished.body.capturedMinor })
  })
})
