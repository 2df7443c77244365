import { parseSync } from 'svgson'
import { beforeAll, describe, expect, inject, it } from 'vitest'
import { inZone } from '../../server/services/workshop-time'
import type { RunSheet } from './answers'
import { signedIn, sqlRow, sqlRows, waitForMail } from './helpers'
import { payCheckout, waitForPaymentState } from './payment-helpers'
import { bookingBench, type BookingBench } from './workshop-setup'

let bench: BookingBench

beforeAll(async () => {
  bench = await bookingBench()
})

async function paidBooking(title: string, daysAhead: number) {
  const jobId = await bench.approvedJob(title)
  const booking = (await bench.member.post('/api/bookings', { jobId, cutterId: bench.cutterId, start: bench.at(daysAhead, '10:00') })).body
  await payCheckout(booking.checkoutUrl)
  await waitForPaymentState(bench.member, booking.id, 'authorised')
  return { jobId, booking, date: inZone(booking.starts_at, bench.zone).toISODate()! }
}

/** What the finish wrote on the job's row. */
interface RecordedFinish { actual_minutes: number; estimated_minutes: number; sheets_used: number; estimated_cut_s: number }

describe('a cutting day through the API', () => {
  it('run sheet → start, pause, resume, finish → capture → ready → collected with a one-time code', async () => {
    const { jobId, booking, date } = await paidBooking('Day run', 20)
    const sheetUrl = `/api/run-sheet?cutter=${bench.cutterId}&date=${date}`
    const sheet = (await bench.staff.get<RunSheet>(sheetUrl)).body
    const entry = sheet.entries.find((e) => e.job.id === jobId)!
    expect(entry).toMatchObject({ paid: true, member: { name: 'Juno Castellane' }, material: { name: 'Birch plywood' } })
    expect(entry.sheets.count).toBeGreaterThanOrEqual(1)
    expect(entry.cautions.map((c) => c.code)).toEqual(expect.arrayContaining(['laser-fire-watch', 'laser-chlorine', 'fume-extraction']))
    expect((await bench.member.get(sheetUrl)).status).toBe(403)

    // The sheet file for the cutter: every coordinate lies on the stock sheet (parsed with svgson, independent of our writer).
    const svg = await fetch(`${inject('baseUrl')}/api/jobs/${jobId}/sheets/1`, { headers: { cookie: '' } })
    expect(svg.status).toBe(401)
    const file = await bench.staff.get(`/api/jobs/${jobId}/sheets/1`)
    expect(file.status).toBe(200)
    const tree = parseSync(file.body as string)
    const [w, h] = tree.attributes.viewBox!.split(' ').slice(2).map(Number)
    const paths = tree.children.flatMap((g) => g.children).filter((c) => c.name === 'path')
    expect(paths.length).toBe(2)
    for (const path of paths) {
      const numbers = path.attributes.d!.match(/-?\d+(\.\d+)?/g)!.map(Number)
      for (let i = 0; i < numbers.length; i += 2) {
        expect(numbers[i]).toBeGreaterThanOrEqual(0)
        expect(numbers[i]).toBeLessThanOrEqual(w!)
        expect(numbers[i + 1]).toBeGreaterThanOrEqual(0)
        expect(numbers[i + 1]).toBeLessThanOrEqual(h!)
      }
    }

    expect((await bench.staff.post(`/api/jobs/${jobId}/start`)).status).toBe(200)
    expect((await bench.staff.post(`/api/jobs/${jobId}/timer`, { action: 'resume' })).status).toBe(409)
    await new Promise((r) => setTimeout(r, 1200))
    const paused = (await bench.staff.post(`/api/jobs/${jobId}/timer`, { action: 'pause' })).body
    expect(paused.running).toBe(false)
    expect(paused.minutes).toBeGreaterThan(1 / 60)
    expect((await bench.staff.post(`/api/jobs/${jobId}/timer`, { action: 'pause' })).status).toBe(409)
    expect((await bench.staff.post(`/api/jobs/${jobId}/timer`, { action: 'resume' })).body.running).toBe(true)
    expect((await bench.staff.post(`/api/jobs/${jobId}/problems`, { kind: 're-cut', note: 'Sheet warped; second pass on panel 2' })).status).toBe(201)
    const during = (await bench.staff.get<RunSheet>(sheetUrl)).body.entries.find((e) => e.job.id === jobId)!
    expect(during.timer.running).toBe(true)
    expect(during.problems[0]).toMatchObject({ kind: 're-cut' })

    // The finish form: the timer, the estimate and what 3 cutting minutes (setup not included) will charge; nothing changes yet.
    const job = (await bench.member.get(`/api/jobs/${jobId}`)).body
    const quote = (await bench.staff.get(`/api/jobs/${jobId}/finish-quote?actualMinutes=3`)).body
    expect(quote).toMatchObject({ actualMinutes: 3, billableMinutes: 3 + 5, setupMinutes: 5, chargeMinor: (3 + 5) * 100 + job.estimate.materialPriceMinor, estimateMinutes: job.estimate.billableMinutes, estimateMinor: booking.estimateMinor, currency: 'EUR' })
    expect(quote.timerMinutes).toBeGreaterThan(0)
    expect((await bench.member.get(`/api/jobs/${jobId}/finish-quote?actualMinutes=3`)).status).toBe(403)
    // A charge confirmed for other minutes captures nothing: typing the whole machine time (3 + 5 setup) is caught.
    const stale = await bench.staff.post(`/api/jobs/${jobId}/finish`, { actualMinutes: 8, confirmedChargeMinor: quote.chargeMinor })
    expect(stale.status).toBe(409)
    expect((await bench.member.get(`/api/jobs/${jobId}`)).body.state).toBe('cutting')
    expect((await waitForPaymentState(bench.member, booking.id, 'authorised')).capturedMinor).toBe(0)
    const finished = await bench.staff.post(`/api/jobs/${jobId}/finish`, { actualMinutes: 3, confirmedChargeMinor: quote.chargeMinor })
    expect(finished.status).toBe(200)
    expect(finished.body.chargeMinor).toBe(quote.chargeMinor)
    // Bench cutter: 100 per minute, 5 setup minutes, per-minute billing, plus the job's sheets.
    expect(finished.body.capturedMinor).toBe((3 + 5) * 100 + job.estimate.materialPriceMinor)
    expect((await waitForPaymentState(bench.member, booking.id, 'captured')).capturedMinor).toBe(finished.body.capturedMinor)

    const recorded = (await sqlRow<RecordedFinish>('select actual_minutes, estimated_minutes, sheets_used, estimated_cut_s from jobs where id = ?', [jobId]))!
    expect(recorded.actual_minutes).toBe(3)
    expect(recorded.estimated_minutes).toBeCloseTo(job.estimate.machineS / 60, 6)
    expect(recorded.sheets_used).toBe(job.estimate.sheetCount)
    expect(recorded.estimated_cut_s).toBeGreaterThan(0)

    expect((await bench.staff.post(`/api/jobs/${jobId}/ready`, { location: '' })).status).toBe(400)
    expect((await bench.staff.post(`/api/jobs/${jobId}/ready`, { location: 'Shelf C, bin 4' })).status).toBe(200)
    const mail = await waitForMail('member@example.test', /Ready to collect: Day run/)
    const code = mail.text.match(/Pickup code: ([A-Z0-9]{6})/)![1]!
    const pickup = (await bench.member.get(`/api/jobs/${jobId}/pickup`)).body
    expect(pickup.code).toBe(code)
    expect(pickup.qrSvg).toContain('<svg')
    expect((await bench.staff.get(`/api/jobs/${jobId}/pickup`)).status).toBe(404)
    expect((await (await signedIn('ines@example.test')).get(`/api/jobs/${jobId}/pickup`)).status).toBe(404)

    expect((await bench.staff.post('/api/pickups/collect', { code: 'ZZZZZZ' })).status).toBe(404)
    expect((await bench.member.post('/api/pickups/collect', { code })).status).toBe(403)
    const collected = await bench.staff.post('/api/pickups/collect', { code: code.toLowerCase() })
    expect(collected.status).toBe(200)
    expect(collected.body.jobId).toBe(jobId)
    expect((await bench.staff.post('/api/pickups/collect', { code })).status).toBe(409)
    expect((await bench.member.get(`/api/jobs/${jobId}`)).body.state).toBe('collected')
    expect((await bench.staff.get<RunSheet>(sheetUrl)).body.entries.some((e) => e.job.id === jobId)).toBe(false)
  })

  it('uses the timer when no minutes are typed, and refuses to start an unpaid booking', async () => {
    const jobId = await bench.approvedJob('Unpaid')
    await bench.member.post('/api/bookings', { jobId, cutterId: bench.cutterId, start: bench.at(21, '10:00') })
    const refused = await bench.staff.post(`/api/jobs/${jobId}/start`)
    expect(refused.status).toBe(409)
    expect(refused.body.message).toMatch(/not paid/)

    const { jobId: timed } = await paidBooking('Timed', 22)
    await bench.staff.post(`/api/jobs/${timed}/start`)
    await new Promise((r) => setTimeout(r, 600))
    const finished = (await bench.staff.post(`/api/jobs/${timed}/finish`, {})).body
    expect(finished.actualMinutes).toBeGreaterThan(0)
    expect(finished.actualMinutes).toBeLessThan(1)
  })

  it('reminds about parts left on the shelf once', async () => {
    const { jobId } = await paidBooking('Left on the shelf', 23)
    await bench.staff.post(`/api/jobs/${jobId}/start`)
    await bench.staff.post(`/api/jobs/${jobId}/finish`, { actualMinutes: 3 })
    await bench.staff.post(`/api/jobs/${jobId}/ready`, { location: 'Rack 2' })
    await sqlRows("update jobs set ready_at = '2026-01-01T00:00:00.000Z' where id = ?", [jobId])
    expect((await bench.admin.post('/api/admin/tasks/pickup-reminders')).body.sent).toBeGreaterThanOrEqual(1)
    expect((await bench.admin.post('/api/admin/tasks/pickup-reminders')).body.sent).toBe(0)
    await waitForMail('member@example.test', /still waiting: Left on the shelf/)
  })

  it('reminds about the other shelved parts when one job’s reminder can’t be written', async () => {
    const { jobId } = await paidBooking('Shelved beside a broken row', 24)
    await bench.staff.post(`/api/jobs/${jobId}/start`)
    await bench.staff.post(`/api/jobs/${jobId}/finish`, { actualMinutes: 2 })
    await bench.staff.post(`/api/jobs/${jobId}/ready`, { location: 'Rack 3' })
    // A shelved job with no pickup code (no route makes one; a damaged row): its mail can't be drawn.
    const [broken] = await sqlRows<{ id: number }>(
      `insert into jobs (member_id, title, cutter_id, material_id, sheet_id, state, ready_at)
       select member_id, 'Broken shelf row', cutter_id, material_id, sheet_id, 'ready', '2025-12-01T00:00:00.000Z' from jobs where id = ? returning id`,
      [jobId],
    )
    try {
      await sqlRows("update jobs set ready_at = '2026-01-01T00:00:00.000Z' where id = ?", [jobId])
      expect((await bench.admin.post('/api/admin/tasks/pickup-reminders')).body.sent).toBe(1)
      await waitForMail('member@example.test', /still waiting: Shelved beside a broken row/)
      // The broken job stays unclaimed for a later round; the good one is not reminded twice.
      expect((await sqlRow<{ pickup_reminded_at: string | null }>('select pickup_reminded_at from jobs where id = ?', [broken!.id]))!.pickup_reminded_at).toBeNull()
      expect((await bench.admin.post('/api/admin/tasks/pickup-reminders')).body.sent).toBe(0)
    } finally {
      await sqlRows('delete from jobs where id = ?', [broken!.id])
    }
  })
})
