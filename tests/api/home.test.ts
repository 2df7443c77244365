// The overview per role: what each one shows, and that each is read with a fixed number of queries whatever
// the number of jobs, bookings and cutters (counted on the test server's own database).
import type { Knex } from 'knex'
import { openDatabase } from '../../db/index'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { adminHome, memberHome, staffHome } from '../../server/services/home'
import { plainPart } from '../fixtures/svg'
import { payCheckout, waitForPaymentState } from './payment-helpers'
import { signedIn } from './helpers'
import { bookingBench, type BookingBench } from './workshop-setup'

let bench: BookingBench
let db: Knex
let memberId: number

beforeAll(async () => {
  bench = await bookingBench()
  db = openDatabase(inject('databaseLocation'))
  memberId = ((await bench.staff.get('/api/staff/members')).body as { id: number; email: string }[]).find((m) => m.email === 'member@example.test')!.id
})

afterAll(async () => {
  await db.destroy()
})

/** How many SQL statements `read` sends. */
async function queriesOf(read: () => Promise<unknown>): Promise<number> {
  let count = 0
  const count1 = () => count++
  db.on('query', count1)
  try {
    await read()
  } finally {
    db.removeListener('query', count1)
  }
  return count
}

describe('the overview per role', () => {
  it('each overview costs the same number of queries with more jobs, bookings and cutters', async () => {
    const day = bench.at(15, '07:00')
    const before = [await queriesOf(() => memberHome(db, memberId)), await queriesOf(() => staffHome(db, day)), await queriesOf(() => adminHome(db, day))]

    const waitingBefore = (await staffHome(db, day)).review.total
    const submitted = (await bench.member.post('/api/jobs', { title: 'Overview: waiting for review', cutterId: bench.cutterId, materialId: bench.materialId })).body.id as number
    const form = new FormData()
    form.set('file', new Blob([plainPart()], { type: 'image/svg+xml' }), 'part.svg')
    await bench.member.form(`/api/jobs/${submitted}/files`, form)
    expect((await bench.member.post(`/api/jobs/${submitted}/submit`, {})).status).toBe(200)
    for (const clock of ['09:00', '10:00']) {
      const jobId = await bench.approvedJob(`Overview: booked at ${clock}`)
      const booking = await bench.member.post('/api/bookings', { jobId, cutterId: bench.cutterId, start: bench.at(15, clock) })
      expect(booking.status).toBe(201)
      // Paid, so the booking is live on the day read below (an unpaid hold lapses long before it).
      await payCheckout(booking.body.checkoutUrl)
      await waitForPaymentState(bench.member, booking.body.id, 'authorised')
    }
    await bench.approvedJob('Overview: to book')
    await bench.admin.post('/api/catalog/cutters', {
      name: `Overview plasma ${Date.now()}`, kind: 'plasma', bedWidthMm: 1500, bedHeightMm: 1500, maxThicknessMm: 12, pricePerMinuteMinor: 150, currency: 'EUR',
      setupMinutes: 5,
      billingIncrementMinutes: 1,
      bookingGranularityMinutes: 15,
      maxSpeedMmPerMin: 8000,
      accelMmPerS2: 1000,
      rapidMmPerMin: 20000,
      junctionDeviationMm: 0.05,
      pierceOverheadS: 0.5,
    })

    const after = [await queriesOf(() => memberHome(db, memberId)), await queriesOf(() => staffHome(db, day)), await queriesOf(() => adminHome(db, day))]
    expect(after).toEqual(before)

    const staff = await staffHome(db, day)
    const sheet = staff.runSheets.find((s) => s.cutterId === bench.cutterId)!
    expect(sheet.slots.map((s) => s.title)).toEqual(['Overview: booked at 09:00', 'Overview: booked at 10:00'])
    expect(sheet.slots.every((s) => s.paid)).toBe(true)
    expect(staff.review.total).toBe(waitingBefore + 1)
  })

  it('a member sees open jobs with what each waits for, the next booking and what is owed', async () => {
    const jobId = await bench.approvedJob('Overview: next booking')
    const booking = await bench.member.post('/api/bookings', { jobId, cutterId: bench.cutterId, start: bench.at(1, '08:00') })
    await payCheckout(booking.body.checkoutUrl)
    await waitForPaymentState(bench.member, booking.body.id, 'authorised')
    const home = (await bench.member.get('/api/home/member')).body
    expect(home.jobs.find((j: { id: number }) => j.id === jobId)).toMatchObject({ state: 'booked', booking: { id: booking.body.id, status: 'confirmed', payUrl: null } })
    expect(home.nextBooking.start <= bench.at(1, '08:00')).toBe(true)
    expect(home.jobs.every((j: { state: string }) => !['collected', 'withdrawn', 'rejected', 'cancelled'].includes(j.state))).toBe(true)
    expect(Array.isArray(home.owed)).toBe(true)
    // Another member's jobs never show.
    const other = (await (await signedIn('ines@example.test')).get('/api/home/member')).body
    expect(other.jobs.map((j: { id: number }) => j.id)).not.toContain(jobId)
  })

  it('an admin sees the week; staff see the staff overview only', async () => {
    const admin = (await bench.admin.get('/api/home/admin')).body
    expect(admin.week.utilisation.map((c: { cutterId: number }) => c.cutterId)).toContain(bench.cutterId)
    const bench7 = admin.week.utilisation.find((c: { cutterId: number }) => c.cutterId === bench.cutterId)
    // The bench cutter is open 08:00–20:00 every day: at most 12 h a day (an hour more across a clock change), less any closure.
    expect(bench7.openMinutes).toBeGreaterThan(0)
    expect(bench7.openMinutes).toBeLessThanOrEqual(7 * 12 * 60 + 60)
    expect((await bench.staff.get('/api/home/admin')).status).toBe(403)
    expect((await bench.staff.get('/api/home/staff')).body.review).toBeTruthy()
  })
})
