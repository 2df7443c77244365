import ICAL from 'ical.js'
import { beforeAll, describe, expect, inject, it } from 'vitest'
import type { ApiResponse } from '../../utils/api-types'
import type { BookingList } from './answers'
import { client, signedIn, sqlRow, waitForMail } from './helpers'
import { payCheckout, waitForPaymentState } from './payment-helpers'
import { bookingBench, type BookingBench } from './workshop-setup'

let bench: BookingBench

beforeAll(async () => {
  bench = await bookingBench()
})

function parseIcs(text: string) {
  const calendar = new ICAL.Component(ICAL.parse(text))
  const events = calendar.getAllSubcomponents('vevent').map((v) => new ICAL.Event(v))
  return { method: calendar.getFirstPropertyValue('method'), events }
}

describe('booking an approved job', () => {
  it('books a slot as long as the estimate plus setup, on the grid, and shows it busy to others', async () => {
    const jobId = await bench.approvedJob('Booked lamp')
    const suggestions = (await bench.member.get(`/api/bookings/suggestions?jobId=${jobId}`)).body
    expect(suggestions.minutes % 15).toBe(0)
    expect(suggestions.slots.length).toBeGreaterThan(0)
    const start = bench.at(3, '10:00')
    const created = await bench.member.post('/api/bookings', { jobId, cutterId: bench.cutterId, start })
    expect(created.status).toBe(201)
    expect(created.body.starts_at).toBe(start)
    const minutes = (Date.parse(created.body.ends_at) - Date.parse(created.body.starts_at)) / 60000
    expect(minutes).toBe(suggestions.minutes)
    const job = (await bench.member.get(`/api/jobs/${jobId}`)).body
    // The job's machine time (one setup included) rounded up to the 15-minute grid.
    expect(minutes).toBe(Math.ceil(job.estimate.machineS / 60 / 15) * 15)
    expect(job.state).toBe('booked')
    const mail = await waitForMail('member@example.test', /Cutter booked/)
    const ics = mail.attachments.find((a) => a.filename === 'booking.ics')!
    expect(ics.contentType).toMatch(/text\/calendar/)
    expect(parseIcs(ics.content).events[0]!.uid).toBe(created.body.ical_uid)

    const range = `cutter=${bench.cutterId}&from=${encodeURIComponent(bench.at(2, '00:00'))}&to=${encodeURIComponent(bench.at(5, '00:00'))}`
    const mine = (await bench.member.get<BookingList>(`/api/bookings?${range}`)).body.find((b) => b.id === created.body.id)!
    expect(mine.title).toBe('Booked lamp')
    const other = (await (await signedIn('ines@example.test')).get<BookingList>(`/api/bookings?${range}`)).body.find((b) => b.id === created.body.id)!
    expect(other).toMatchObject({ start, own: false })
    expect(other.title).toBeUndefined()
    expect(other.memberName).toBeUndefined()
    const staffView = (await bench.staff.get<BookingList>(`/api/bookings?${range}`)).body.find((b) => b.id === created.body.id)!
    expect(staffView.memberName).toBe('Juno Castellane')

    // A cutter with bookings keeps its history: deleting it is refused, retiring it is the way.
    const deletion = await bench.admin.delete(`/api/catalog/cutters/${bench.cutterId}`)
    expect(deletion.status).toBe(409)
    expect(deletion.body.data.uses).toContain('bookings')
  })

  it('gives exactly one of 50 simultaneous overlapping requests the slot', async () => {
    const jobs: number[] = []
    for (let batch = 0; batch < 5; batch++) jobs.push(...(await Promise.all(Array.from({ length: 10 }, (_, i) => bench.approvedJob(`Race ${batch * 10 + i}`)))))
    const start = bench.at(9, '12:00')
    const responses = await Promise.all(jobs.map((jobId) => bench.member.post('/api/bookings', { jobId, cutterId: bench.cutterId, start })))
    const statuses = responses.map((r) => r.status)
    expect(statuses.filter((s) => s === 201)).toHaveLength(1)
    expect(statuses.filter((s) => s === 409)).toHaveLength(49)
    expect(responses.filter((r) => r.status === 409).every((r) => r.body.data.reason === 'overlap')).toBe(true)

    const clashes = await sqlRow<{ n: number }>(`select count(*) as n from bookings a join bookings b on a.cutter_id = b.cutter_id and a.id < b.id
                where a.status != 'cancelled' and b.status != 'cancelled' and a.starts_at < b.ends_at and a.ends_at > b.starts_at`)
    expect(clashes!.n).toBe(0)
  })
})

describe('each rule says no with its own reason', () => {
  async function refusal(body: Record<string, unknown>, as = bench.member) {
    const response = await as.post('/api/bookings', body)
    expect(response.status).toBe(409)
    return response.body.data.reason as string
  }

  it('past, horizon, grid, hours, closure, cutter status', async () => {
    const jobId = await bench.approvedJob('Rules')
    const at = (days: number, clock: string) => ({ jobId, cutterId: bench.cutterId, start: bench.at(days, clock) })
    expect(await refusal(at(-1, '10:00'))).toBe('in-past')
    expect(await refusal(at(60, '10:00'))).toBe('beyond-horizon')
    expect(await refusal(at(4, '10:05'))).toBe('off-grid')
    expect(await refusal(at(4, '07:00'))).toBe('outside-hours')
    expect(await refusal(at(4, '19:55'))).toBe('off-grid')

    const closure = await bench.staff.post('/api/catalog/closures', { cutterId: bench.cutterId, startsAt: bench.at(5, '09:00'), endsAt: bench.at(5, '12:00'), reason: 'Lens swap' })
    expect(closure.status).toBe(201)
    expect(await refusal(at(5, '10:00'))).toBe('closed')

    await bench.staff.patch(`/api/catalog/cutters/${bench.cutterId}`, { status: 'maintenance' })
    expect(await refusal(at(6, '10:00'))).toBe('cutter-inactive')
    await bench.staff.patch(`/api/catalog/cutters/${bench.cutterId}`, { status: 'active' })
    expect((await bench.member.post('/api/bookings', at(6, '10:00'))).status).toBe(201)
  })

  it('sign-off, job state, double booking, weekly limit', async () => {
    const priya = await signedIn('priya@example.test')
    const priyaJob = await bench.approvedJob('No induction', priya)
    expect(await refusal({ jobId: priyaJob, cutterId: bench.cutterId, start: bench.at(7, '10:00') }, priya)).toBe('no-sign-off')

    const draft = await bench.member.post('/api/jobs', { title: 'Still a draft', cutterId: bench.cutterId, materialId: bench.materialId })
    expect(await refusal({ jobId: draft.body.id, cutterId: bench.cutterId, start: bench.at(7, '10:00') })).toBe('job-not-approved')

    const jobId = await bench.approvedJob('Twice')
    expect((await bench.member.post('/api/bookings', { jobId, cutterId: bench.cutterId, start: bench.at(7, '14:00') })).status).toBe(201)
    expect(await refusal({ jobId, cutterId: bench.cutterId, start: bench.at(7, '16:00') })).toBe('already-booked')

    await bench.admin.patch('/api/admin/settings', { weeklyLimitMinutes: 15 })
    try {
      const another = await bench.approvedJob('Over the limit')
      expect(await refusal({ jobId: another, cutterId: bench.cutterId, start: bench.at(7, '17:00') })).toBe('weekly-limit')
    } finally {
      await bench.admin.patch('/api/admin/settings', { weeklyLimitMinutes: 480 })
    }
  })

  it('answers 400 for a malformed start and 404 for another member’s job', async () => {
    const jobId = await bench.approvedJob('Malformed')
    expect((await bench.member.post('/api/bookings', { jobId, cutterId: bench.cutterId, start: 'next tuesday' })).status).toBe(400)
    expect((await (await signedIn('ines@example.test')).post('/api/bookings', { jobId, cutterId: bench.cutterId, start: bench.at(8, '10:00') })).status).toBe(404)
    expect((await client().get('/api/bookings?from=2027-01-01T00:00:00Z&to=2027-01-02T00:00:00Z')).status).toBe(401)
  })
})

describe('time zones', () => {
  it('books the right UTC instants on both sides of the spring change in Europe/London', async () => {
    const before = (await bench.admin.get('/api/settings')).body
    await bench.admin.patch('/api/admin/settings', { timeZone: 'Europe/London', bookingHorizonDays: 366 })
    try {
      // 2027-03-28 is the last Sunday of March: clocks go from GMT (UTC+0) to BST (UTC+1) (UK time law, EU summer-time directive).
      const winterJob = await bench.approvedJob('Before the change')
      const summerJob = await bench.approvedJob('After the change')
      const winter = await bench.member.post('/api/bookings', { jobId: winterJob, cutterId: bench.cutterId, start: '2027-03-27T10:00:00+00:00' })
      const summer = await bench.member.post('/api/bookings', { jobId: summerJob, cutterId: bench.cutterId, start: '2027-03-29T10:00:00+01:00' })
      expect(winter.status).toBe(201)
      expect(summer.status).toBe(201)
      expect(winter.body.starts_at).toBe('2027-03-27T10:00:00.000Z')
      expect(summer.body.starts_at).toBe('2027-03-29T09:00:00.000Z')
      // 08:00 London on the Monday is 07:00 UTC: inside opening hours; 07:45 London (06:45 UTC) is not.
      const early = await bench.approvedJob('Early')
      expect((await bench.member.post('/api/bookings', { jobId: early, cutterId: bench.cutterId, start: '2027-03-29T06:45:00Z' })).body.data.reason).toBe('outside-hours')
      const availability = (await bench.member.get<ApiResponse<'/api/catalog/cutters/:id/availability'>>(`/api/catalog/cutters/${bench.cutterId}/availability?from=2027-03-27T00:00:00Z&to=2027-03-30T00:00:00Z`)).body
      expect(availability.open.map((i) => i.start)).toEqual(['2027-03-27T08:00:00.000Z', '2027-03-28T07:00:00.000Z', '2027-03-29T07:00:00.000Z'])
    } finally {
      await bench.admin.patch('/api/admin/settings', { timeZone: before.timeZone, bookingHorizonDays: before.bookingHorizonDays })
    }
  })
})

describe('moving, cancelling and calendar files', () => {
  it('keeps the UID, raises SEQUENCE on each change and sends a cancellation as METHOD:CANCEL', async () => {
    const jobId = await bench.approvedJob('Calendar')
    const start = bench.at(10, '09:00')
    const booking = (await bench.member.post('/api/bookings', { jobId, cutterId: bench.cutterId, start })).body
    const first = parseIcs((await bench.member.get(`/api/bookings/${booking.id}/calendar`)).body)
    expect(first.method).toBe('REQUEST')
    expect(first.events).toHaveLength(1)
    expect(first.events[0]!.uid).toBe(booking.ical_uid)
    expect(first.events[0]!.startDate.toJSDate().toISOString()).toBe(booking.starts_at)
    expect(first.events[0]!.endDate.toJSDate().toISOString()).toBe(booking.ends_at)
    expect(first.events[0]!.sequence).toBe(0)

    const moved = await bench.member.patch(`/api/bookings/${booking.id}`, { start: bench.at(10, '11:00') })
    expect(moved.status).toBe(200)
    const second = parseIcs((await bench.member.get(`/api/bookings/${booking.id}/calendar`)).body)
    expect(second.events[0]!.uid).toBe(booking.ical_uid)
    expect(second.events[0]!.sequence).toBe(1)
    expect(second.events[0]!.startDate.toJSDate().toISOString()).toBe(bench.at(10, '11:00'))

    expect((await bench.staff.patch(`/api/bookings/${booking.id}`, { start: bench.at(10, '13:00') })).status).toBe(400)
    expect((await bench.staff.patch(`/api/bookings/${booking.id}`, { start: bench.at(10, '13:00'), reason: 'Laser service in the morning' })).status).toBe(200)
    expect((await waitForMail('member@example.test', /Your booking was moved/)).text).toContain('Laser service')

    const terms = (await bench.member.get(`/api/bookings/${booking.id}/cancellation-terms`)).body
    expect(terms.late).toBe(false)
    const cancelled = await bench.member.post(`/api/bookings/${booking.id}/cancel`, {})
    expect(cancelled.status).toBe(200)
    const third = parseIcs((await bench.member.get(`/api/bookings/${booking.id}/calendar`)).body)
    expect(third.method).toBe('CANCEL')
    expect(third.events[0]!.uid).toBe(booking.ical_uid)
    expect(third.events[0]!.sequence).toBe(3)
    expect(third.events[0]!.component.getFirstPropertyValue('status')).toBe('CANCELLED')
    // The job can be booked again.
    expect((await bench.member.get(`/api/jobs/${jobId}`)).body.state).toBe('approved')
  })

  it('states the late-cancellation fee before a late cancel', async () => {
    const jobId = await bench.approvedJob('Late')
    const booking = (await bench.member.post('/api/bookings', { jobId, cutterId: bench.cutterId, start: bench.at(11, '09:00') })).body
    await bench.admin.patch('/api/admin/settings', { freeCancellationHours: 300 })
    try {
      const terms = (await bench.member.get(`/api/bookings/${booking.id}/cancellation-terms`)).body
      expect(terms).toMatchObject({ late: true, feePercent: 50 })
      // Moving it now would dodge the fee: refused for the member, allowed for staff with a reason.
      const moved = await bench.member.patch(`/api/bookings/${booking.id}`, { start: bench.at(11, '13:00') })
      expect(moved.status).toBe(409)
      expect(moved.body.message).toMatch(/late-cancellation window/)
      expect((await bench.staff.patch(`/api/bookings/${booking.id}`, { start: bench.at(11, '13:00'), reason: 'Swapped with a maintenance slot' })).status).toBe(200)
    } finally {
      await bench.admin.patch('/api/admin/settings', { freeCancellationHours: 24 })
    }
  })

  it('serves a private feed that parses, and a replaced link stops working', async () => {
    const jobId = await bench.approvedJob('Feed')
    const booking = (await bench.member.post('/api/bookings', { jobId, cutterId: bench.cutterId, start: bench.at(12, '09:00') })).body
    const { url } = (await bench.member.post('/api/me/calendar-feed')).body
    const path = new URL(url).pathname
    const feed = await fetch(`${inject('baseUrl')}${path}`)
    expect(feed.status).toBe(200)
    const parsed = parseIcs(await feed.text())
    expect(parsed.events.map((e) => e.uid)).toContain(booking.ical_uid)
    await bench.member.post('/api/me/calendar-feed')
    expect((await fetch(`${inject('baseUrl')}${path}`)).status).toBe(404)
  })

  it('sends a day-before reminder once, however often the task runs', async () => {
    const jobId = await bench.approvedJob('Reminder')
    const booking = (await bench.member.post('/api/bookings', { jobId, cutterId: bench.cutterId, start: bench.at(1, '19:00') })).body
    // Only a paid (confirmed) booking is reminded: pay first.
    await payCheckout(booking.checkoutUrl)
    await waitForPaymentState(bench.member, booking.id, 'authorised')
    const first = (await bench.admin.post('/api/admin/tasks/send-reminders')).body.sent
    const second = (await bench.admin.post('/api/admin/tasks/send-reminders')).body.sent
    expect(first).toBeGreaterThanOrEqual(1)
    expect(second).toBe(0)
    await waitForMail('member@example.test', /Reminder: your cutter time is tomorrow/)
  })
})
