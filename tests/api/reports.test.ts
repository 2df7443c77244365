// Reports against the tables they summarise: a day of bookings, payments, cuts and reviews on a cutter of
// this file's own, then every report's totals recomputed straight from the database, and every CSV read back.
import { DateTime } from 'luxon'
import Papa from 'papaparse'
import { beforeAll, describe, expect, it } from 'vitest'
import { median, nearestRankPercentile } from '../../server/services/reports/statistics'
import { plainPart } from '../fixtures/svg'
import { signedIn, sqlRows } from './helpers'
import { payCheckout, waitForPaymentState } from './payment-helpers'
import { bookingBench, type BookingBench, type Client } from './workshop-setup'

let bench: BookingBench
let ines: Client
let range: { from: string; to: string; fromIso: string; toIso: string }
const finishedMinutes = [37, 12.5, 20]

const query = <T>(sql: string, ...params: unknown[]) => sqlRows<T>(sql, params)

const sum = <T>(rows: T[], value: (row: T) => number) => rows.reduce((total, row) => total + value(row), 0)
const minutesOf = (from: string, to: string) => (Date.parse(to) - Date.parse(from)) / 60_000
const reportPath = (name: string, extra = '') => `/api/reports/${name}?from=${range.from}&to=${range.to}&cutter=${bench.cutterId}${extra}`

async function report<Row = any, Summary = any>(name: string): Promise<{ rows: Row[]; summary: Summary; from: string; to: string; cutterId: number }> {
  const response = await bench.staff.get(reportPath(name))
  expect(response.status, JSON.stringify(response.body)).toBe(200)
  return response.body as any
}

/** A job booked on `days` from now at 09:00, paid, cut and finished with `actualMinutes`. */
async function finishedJob(title: string, days: number, actualMinutes: number) {
  const jobId = await bench.approvedJob(title, ines)
  const booking = (await ines.post('/api/bookings', { jobId, cutterId: bench.cutterId, start: bench.at(days, '09:00') })).body
  expect(booking.status, JSON.stringify(booking)).toBe('held')
  await payCheckout(booking.checkoutUrl)
  await waitForPaymentState(ines, booking.id, 'authorised')
  expect((await bench.staff.post(`/api/jobs/${jobId}/start`)).status).toBe(200)
  expect((await bench.staff.post(`/api/jobs/${jobId}/finish`, { actualMinutes })).status).toBe(200)
  // A cut longer than the hold leaves a balance to pay; either way the capture is done.
  await waitForPaymentState(ines, booking.id, ['captured', 'balance-due'])
  return { jobId, bookingId: booking.id as number }
}

beforeAll(async () => {
  bench = await bookingBench()
  ines = await signedIn('ines@example.test')
  const members = (await bench.staff.get('/api/staff/members')).body as { id: number; email: string }[]
  await bench.staff.post('/api/sign-offs', { userId: members.find((m) => m.email === 'ines@example.test')!.id, cutterId: bench.cutterId, signedOffOn: '2026-01-05' })

  const first = await finishedJob('Report: coasters', 20, finishedMinutes[0]!)
  await finishedJob('Report: lamp panels', 21, finishedMinutes[1]!)
  await finishedJob('Report: drawer fronts', 22, finishedMinutes[2]!)
  expect((await bench.staff.post(`/api/payments/${first.bookingId}/refund`, { amountMinor: 300, reason: 'One coaster scorched' })).status).toBe(200)
  // The refund is on the ledger when the route answers; a balance still to pay outranks it in the state.
  expect((await waitForPaymentState(ines, first.bookingId, ['partly-refunded', 'balance-due'])).refundedMinor).toBe(300)
  // Booked and not yet paid: a live booking that earns nothing yet.
  const heldJob = await bench.approvedJob('Report: held', ines)
  expect((await ines.post('/api/bookings', { jobId: heldJob, cutterId: bench.cutterId, start: bench.at(23, '09:00') })).status).toBe(201)
  // A staff block is no booked minute; a review sent back counts as a turnaround.
  expect((await bench.staff.post('/api/bookings/blocks', { cutterId: bench.cutterId, start: bench.at(24, '08:00'), end: bench.at(24, '12:00'), reason: 'Mirror cleaning' })).status).toBe(201)
  const sentBack = (await bench.member.post('/api/jobs', { title: 'Report: sent back', cutterId: bench.cutterId, materialId: bench.materialId })).body.id
  const form = new FormData()
  form.set('file', new Blob([plainPart()], { type: 'image/svg+xml' }), 'part.svg')
  await bench.member.form(`/api/jobs/${sentBack}/files`, form)
  await bench.member.post(`/api/jobs/${sentBack}/submit`, {})
  expect((await bench.staff.post(`/api/jobs/${sentBack}/request-changes`, { comment: 'Close the outline, please.' })).status).toBe(200)

  const today = DateTime.now().setZone(bench.zone).startOf('day')
  const from = today.minus({ days: 1 })
  const to = today.plus({ days: 29 })
  range = { from: from.toISODate()!, to: to.toISODate()!, fromIso: from.toUTC().toISO()!, toIso: to.toUTC().toISO()! }
}, 180_000)

describe('report totals equal sums over the tables', () => {
  it('utilisation: opening minutes less closures, live job bookings, minutes logged at finish', async () => {
    const { rows } = await report('utilisation')
    const hours = await query<{ weekday: number; opens_at: string; closes_at: string }>('select weekday, opens_at, closes_at from opening_hours where cutter_id = ?', bench.cutterId)
    const closures = await query<{ starts_at: string; ends_at: string }>('select starts_at, ends_at from closures where (cutter_id is null or cutter_id = ?) and starts_at < ? and ends_at > ?', bench.cutterId, range.toIso, range.fromIso)
    let openMinutes = 0
    for (let day = DateTime.fromISO(range.from, { zone: bench.zone }); day.toISODate()! < range.to; day = day.plus({ days: 1 })) {
      for (const period of hours.filter((h) => h.weekday === day.weekday)) {
        const opens = DateTime.fromISO(`${day.toISODate()}T${period.opens_at}`, { zone: bench.zone }).toUTC().toISO()!
        const closes = DateTime.fromISO(`${day.toISODate()}T${period.closes_at}`, { zone: bench.zone }).toUTC().toISO()!
        const closed = sum(closures, (c) => Math.max(0, minutesOf(c.starts_at > opens ? c.starts_at : opens, c.ends_at < closes ? c.ends_at : closes)))
        openMinutes += minutesOf(opens, closes) - closed
      }
    }
    const bookings = await query<{ starts_at: string; ends_at: string }>(
      "select starts_at, ends_at from bookings where cutter_id = ? and kind = 'job' and status != 'cancelled' and (hold_expires_at is null or hold_expires_at > ?) and starts_at < ? and ends_at > ?",
      bench.cutterId, new Date().toISOString(), range.toIso, range.fromIso,
    )
    const cut = await query<{ actual_minutes: number }>('select actual_minutes from jobs where cutter_id = ? and cut_finished_at >= ? and cut_finished_at < ?', bench.cutterId, range.fromIso, range.toIso)

    expect(rows.length).toBeGreaterThanOrEqual(5)
    expect(sum(rows, (r) => r.openMinutes)).toBeCloseTo(openMinutes, 6)
    expect(sum(rows, (r) => r.bookedMinutes)).toBeCloseTo(sum(bookings, (b) => minutesOf(b.starts_at, b.ends_at)), 6)
    expect(bookings).toHaveLength(4)
    expect(sum(rows, (r) => r.cuttingMinutes)).toBeCloseTo(sum(cut, (j) => j.actual_minutes), 6)
    expect(sum(cut, (j) => j.actual_minutes)).toBeCloseTo(sum(finishedMinutes, (m) => m), 6)
    for (const row of rows) if (row.openMinutes > 0) expect(row.bookedPercent).toBeCloseTo((row.bookedMinutes / row.openMinutes) * 100, 0)
  })

  it('revenue: captured + fee + charged − refunded of the cutter’s bookings, holds left out', async () => {
    const { rows } = await report('revenue')
    const ledger = await query<{ kind: string; amount_minor: number; currency: string }>(
      'select l.kind, l.amount_minor, l.currency from payment_ledger l join bookings b on b.id = l.booking_id where b.cutter_id = ? and l.created_at >= ? and l.created_at < ?',
      bench.cutterId, range.fromIso, range.toIso,
    )
    const of = (...kinds: string[]) => sum(ledger.filter((l) => kinds.includes(l.kind)), (l) => l.amount_minor)
    expect(of('captured')).toBeGreaterThan(0)
    expect(of('authorised')).toBeGreaterThan(0)
    expect(sum(rows, (r) => r.revenueMinor)).toBe(of('captured', 'fee', 'charged') - of('refunded'))
    expect(sum(rows, (r) => r.capturedMinor)).toBe(of('captured'))
    expect(sum(rows, (r) => r.refundedMinor)).toBe(300)
    expect(new Set(rows.map((r) => r.cutterId))).toEqual(new Set([bench.cutterId]))
    expect(rows.every((r) => r.currency === 'EUR')).toBe(true)
  })

  it('minutes by member: the utilisation’s booked minutes split by member, and the minutes cut', async () => {
    const [{ rows }, utilisation] = await Promise.all([report('minutes-by-member'), report('utilisation')])
    const cut = await query<{ member_id: number; actual_minutes: number }>('select member_id, actual_minutes from jobs where cutter_id = ? and cut_finished_at >= ? and cut_finished_at < ?', bench.cutterId, range.fromIso, range.toIso)
    expect(sum(rows, (r) => r.bookedMinutes)).toBeCloseTo(sum(utilisation.rows, (r: any) => r.bookedMinutes), 6)
    expect(sum(rows, (r) => r.cutMinutes)).toBeCloseTo(sum(cut, (j) => j.actual_minutes), 6)
    const inesRow = rows.find((r) => r.memberId === cut[0]!.member_id)
    expect(inesRow).toMatchObject({ bookings: 4, finishedJobs: 3 })
  })

  it('materials: sheets recorded at finish, by material', async () => {
    const { rows } = await report('materials')
    const jobs = await query<{ material_id: number; sheets_used: number | null }>('select material_id, sheets_used from jobs where cutter_id = ? and cut_finished_at >= ? and cut_finished_at < ?', bench.cutterId, range.fromIso, range.toIso)
    expect(rows.map((r) => r.materialId)).toEqual([bench.materialId])
    expect(rows[0]).toMatchObject({
      finishedJobs: 3,
      sheets: sum(jobs, (j) => j.sheets_used ?? 0),
      jobsWithoutSheetCount: jobs.filter((j) => j.sheets_used === null).length,
    })
    expect(rows[0].sheets).toBeGreaterThanOrEqual(3)
  })

  it('jobs by state: the cutter’s jobs created in the range, every state listed', async () => {
    const { rows } = await report('jobs-by-state')
    const counts = await query<{ state: string; jobs: number }>('select state, count(*) as jobs from jobs where cutter_id = ? and created_at >= ? and created_at < ? group by state', bench.cutterId, range.fromIso, range.toIso)
    expect(rows.filter((r) => r.jobs > 0).map((r) => [r.state, r.jobs]).sort()).toEqual(counts.map((c) => [c.state, c.jobs]).sort())
    expect(rows.find((r) => r.state === 'cut')?.jobs).toBe(3)
    expect(rows).toHaveLength(12)
  })

  it('turnaround: each submission to its first review, median and mean of the hours', async () => {
    const { rows, summary } = await report('turnaround')
    const events = await query<{ job_id: number; to_state: string; created_at: string }>(
      "select e.job_id, e.to_state, e.created_at from job_events e join jobs j on j.id = e.job_id where j.cutter_id = ? and e.from_state = 'submitted' and e.to_state in ('approved', 'changes_requested', 'rejected') order by e.id",
      bench.cutterId,
    )
    expect(rows.map((r) => [r.jobId, r.outcome, r.reviewedAt])).toEqual(
      events.map((e) => [e.job_id, e.to_state, e.created_at]).sort((a, b) => Number(a[0]) - Number(b[0])),
    )
    expect(rows.some((r) => r.outcome === 'changes_requested')).toBe(true)
    for (const row of rows) expect(row.hours).toBeCloseTo(minutesOf(row.submittedAt, row.reviewedAt) / 60, 2)
    expect(summary.reviews).toBe(rows.length)
    expect(summary.medianHours).toBeCloseTo(median(rows.map((r) => r.hours))!, 2)
  })

  it('estimate accuracy: estimate without setup against minutes logged, median and nearest-rank 90th percentile', async () => {
    const [accuracy, points] = await Promise.all([report('estimate-accuracy'), report('estimate-points')])
    const jobs = await query<{ id: number; estimated_minutes: number; estimated_setup_s: number; actual_minutes: number }>(
      'select id, estimated_minutes, estimated_setup_s, actual_minutes from jobs where cutter_id = ? and cut_finished_at >= ? and cut_finished_at < ? and estimated_minutes is not null order by id',
      bench.cutterId, range.fromIso, range.toIso,
    )
    expect(jobs).toHaveLength(3)
    const byJob = new Map(points.rows.map((p: any) => [p.jobId, p]))
    const errors = jobs.map((j) => {
      const estimated = j.estimated_minutes - j.estimated_setup_s / 60
      const point: any = byJob.get(j.id)
      expect(point.estimatedMinutes).toBeCloseTo(estimated, 2)
      expect(point.actualMinutes).toBe(j.actual_minutes)
      expect(point.percentError).toBeCloseTo(((estimated - j.actual_minutes) / j.actual_minutes) * 100, 1)
      return Math.abs(point.percentError)
    })
    expect(accuracy.rows).toHaveLength(1)
    expect(accuracy.rows[0]).toMatchObject({ cutterId: bench.cutterId, materialId: bench.materialId, jobs: 3 })
    expect(accuracy.rows[0].medianAbsPercentError).toBeCloseTo(median(errors)!, 0)
    // Three values: the 90th percentile by nearest rank is the largest (⌈0.9 · 3⌉ = 3rd).
    expect(accuracy.rows[0].p90AbsPercentError).toBeCloseTo(Math.max(...errors), 0)
    expect(accuracy.summary.jobs).toBe(3)
  })

  it('median and nearest-rank percentile as documented', () => {
    expect(median([4, 1, 3, 2])).toBe(2.5)
    expect(median([])).toBeNull()
    expect(nearestRankPercentile([...Array(10).keys()].map((i) => i + 1), 90)).toBe(9)
    expect(nearestRankPercentile([...Array(20).keys()].map((i) => i + 1), 90)).toBe(18)
    expect(nearestRankPercentile([7], 90)).toBe(7)
  })
})

describe('CSV and access', () => {
  const names = ['utilisation', 'revenue', 'minutes-by-member', 'materials', 'jobs-by-state', 'turnaround', 'estimate-accuracy', 'estimate-points']

  it.each(names)('%s: the CSV reads back to the JSON rows', async (name) => {
    const json = await report(name)
    const csv = await bench.staff.get(reportPath(name, '&format=csv'))
    expect(csv.status).toBe(200)
    expect(csv.headers.get('content-type')).toMatch(/^text\/csv/)
    expect(csv.headers.get('content-disposition')).toContain(`kerfbook-${name}-${range.from}-to-${range.to}.csv`)
    // Instants stay text, as in the JSON; everything else is typed back (numbers, empty → null).
    const parsed = Papa.parse<Record<string, unknown>>(csv.body as string, { header: true, skipEmptyLines: true, dynamicTyping: (column) => !String(column).endsWith('At') })
    expect(parsed.errors).toEqual([])
    expect(parsed.data).toEqual(json.rows)
    expect(json.rows.length).toBeGreaterThan(0)
  })

  it('members may not read reports; bad ranges are refused with a reason', async () => {
    expect((await bench.member.get(reportPath('revenue'))).status).toBe(403)
    expect((await bench.admin.get(reportPath('revenue'))).status).toBe(200)
    const backwards = await bench.staff.get(`/api/reports/revenue?from=${range.to}&to=${range.from}`)
    expect(backwards.status).toBe(400)
    expect(backwards.body.data.fields.to).toBe('"to" must be after "from".')
    expect((await bench.staff.get('/api/reports/revenue?from=yesterday')).status).toBe(400)
  })

  it('without dates: the last eight weeks up to today, in the workshop’s zone', async () => {
    const today = DateTime.now().setZone(bench.zone)
    const body = (await bench.staff.get(`/api/reports/jobs-by-state?cutter=${bench.cutterId}`)).body
    expect(body.to).toBe(today.plus({ days: 1 }).toISODate())
    expect(body.from).toBe(today.plus({ days: 1 }).minus({ weeks: 8 }).toISODate())
    expect(body.timeZone).toBe(bench.zone)
  })
})
