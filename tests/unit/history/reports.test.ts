// The reports over a small history written by hand round a week boundary and the end of summer time in the
// workshop's zone (Europe/Dublin: IST = UTC+1 until 01:00 UTC on Sunday 25 October 2026, then GMT = UTC). Every
// expected figure is worked out in the comments from the rows inserted here, not taken from the code under test.
import type { Knex } from 'knex'
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import { REPORTS, resolveRange } from '../../../server/services/reports/index'
import { demoDatabase } from './database'

// Databases of a busy history take seconds to write on a shared machine.
vi.setConfig({ testTimeout: 120_000, hookTimeout: 120_000 })

let db: Knex
let close: () => Promise<void>
const ids = { laser: 0, plasma: 0, birch: 0, birchSheet: 0, board: 0, boardSheet: 0, steel: 0, steelSheet: 0, ines: 0, juno: 0 }

// ISO weeks 43 (Mon 19 – Sun 25 Oct, local) and 44 (Mon 26 Oct – Sun 1 Nov); the range ends at local midnight on 2 November.
const RANGE = { from: '2026-10-19', to: '2026-11-02' }

async function job(values: Record<string, unknown>): Promise<number> {
  const [id] = await db('jobs').insert({ title: 'Hand-made history', state: 'collected', ...values })
  return id!
}

// Each report's own row type, which a call through the union of all reports would lose.
type Built<Name extends keyof typeof REPORTS> = Awaited<ReturnType<(typeof REPORTS)[Name]['build']>>

async function build<Name extends keyof typeof REPORTS>(name: Name, cutter?: number): Promise<Built<Name>> {
  return (await REPORTS[name].build(db, await resolveRange(db, { ...RANGE, cutter }))) as Built<Name>
}

beforeAll(async () => {
  ;({ db, close } = await demoDatabase())
  const idOf = async (table: string, where: Record<string, unknown>) => (await db(table).where(where).first('id')).id as number
  ids.laser = await idOf('cutters', { kind: 'co2-laser' })
  ids.plasma = await idOf('cutters', { kind: 'plasma' })
  ids.birch = await idOf('materials', { name: 'Birch plywood' })
  ids.birchSheet = await idOf('material_sheets', { material_id: ids.birch })
  ids.board = await idOf('materials', { name: 'Grey board' })
  ids.boardSheet = await idOf('material_sheets', { material_id: ids.board })
  ids.steel = await idOf('materials', { name: 'Mild steel', thickness_mm: 1.5 })
  ids.steelSheet = await idOf('material_sheets', { material_id: ids.steel })
  ids.ines = await idOf('users', { email: 'ines@example.test' })
  ids.juno = await idOf('users', { email: 'member@example.test' })
  const laserJob = { cutter_id: ids.laser, material_id: ids.birch, sheet_id: ids.birchSheet }

  // Finished cuts. J1: Sunday 18 Oct 23:30 UTC is Monday 19 Oct 00:30 IST, so week 43 (in UTC it would be week 42).
  const j1 = await job({ ...laserJob, member_id: ids.ines, actual_minutes: 25.5, sheets_used: 2, cut_finished_at: '2026-10-18T23:30:00.000Z' })
  // J2: Monday 26 Oct 00:10 GMT, week 44; its sheets were not recorded.
  const j2 = await job({ ...laserJob, member_id: ids.juno, actual_minutes: 40, sheets_used: null, cut_finished_at: '2026-10-26T00:10:00.000Z' })
  // J3: finished before the finish time was recorded; its move to "cut" on Wednesday 28 Oct counts, week 44.
  const j3 = await job({
    cutter_id: ids.laser,
    material_id: ids.board,
    sheet_id: ids.boardSheet,
    member_id: ids.juno,
    actual_minutes: 12,
    sheets_used: 1,
    cut_finished_at: null,
  })
  await db('job_events').insert([
    { job_id: j3, from_state: 'cutting', to_state: 'cut', created_at: '2026-10-28T10:00:00.000Z' },
    { job_id: j3, from_state: 'booked', to_state: 'cutting', created_at: '2026-10-28T09:30:00.000Z' },
  ])
  // J4: exactly at the end of the range (exclusive): left out. J5: on the plasma table, in week 43.
  await job({ ...laserJob, member_id: ids.ines, actual_minutes: 99, sheets_used: 5, cut_finished_at: '2026-11-02T00:00:00.000Z' })
  const j5 = await job({ cutter_id: ids.plasma, material_id: ids.steel, sheet_id: ids.steelSheet, member_id: ids.ines, actual_minutes: 30, sheets_used: 1, cut_finished_at: '2026-10-21T10:00:00.000Z' })

  // Bookings on the laser. B1: Tuesday 20 Oct 10:00–11:30 IST = 09:00–10:30 UTC, 90 min in week 43.
  const booking = (values: Record<string, unknown>) => ({ cutter_id: ids.laser, kind: 'job', status: 'confirmed', currency: 'EUR', checkout_session_id: `cs_${values.ical_uid}`, ...values })
  const [b1] = await db('bookings').insert(booking({ job_id: j1, member_id: ids.ines, starts_at: '2026-10-20T09:00:00.000Z', ends_at: '2026-10-20T10:30:00.000Z', ical_uid: 'b1' }))
  // B2: Sunday 25 Oct 23:00 – Monday 26 Oct 01:00 GMT: 60 min in week 43 and 60 in week 44.
  const [b2] = await db('bookings').insert(booking({ job_id: j2, member_id: ids.juno, starts_at: '2026-10-25T23:00:00.000Z', ends_at: '2026-10-26T01:00:00.000Z', ical_uid: 'b2' }))
  // Not counted: a cancelled booking, a staff block, a hold whose time to pay ran out.
  await db('bookings').insert([
    booking({ job_id: j3, member_id: ids.juno, starts_at: '2026-10-28T09:00:00.000Z', ends_at: '2026-10-28T11:00:00.000Z', status: 'cancelled', ical_uid: 'b3' }),
    booking({ kind: 'block', starts_at: '2026-10-29T09:00:00.000Z', ends_at: '2026-10-29T12:00:00.000Z', ical_uid: 'b4' }),
    booking({ job_id: j3, member_id: ids.juno, starts_at: '2026-10-30T09:00:00.000Z', ends_at: '2026-10-30T10:00:00.000Z', status: 'held', hold_expires_at: '2026-10-20T00:00:00.000Z', ical_uid: 'b5' }),
  ])

  // The ledger of B1 (laser, week by the entry's local time).
  const entry = (kind: string, amount: number, at: string, bookingId: number | null = b1!, jobId = j1) => ({ booking_id: bookingId, job_id: jobId, member_id: ids.ines, kind, amount_minor: amount, currency: 'EUR', stripe_object_id: 'pi', ledger_key: `${kind}:${at}:${amount}`, created_at: at })
  await db('payment_ledger').insert([
    entry('authorised', 5000, '2026-10-20T08:00:00.000Z'), // holds money only: never revenue
    entry('captured', 400, '2026-10-18T22:59:00.000Z'), // Sunday 18 Oct 23:59 IST: week 42, before the range
    entry('captured', 1000, '2026-10-18T23:30:00.000Z'), // Monday 19 Oct 00:30 IST: week 43
    entry('fee', 250, '2026-10-25T23:59:00.000Z'), // Sunday 25 Oct 23:59 GMT: week 43
    entry('captured', 700, '2026-10-26T00:00:00.000Z', b2!, j2), // Monday 26 Oct 00:00 GMT: week 44
    entry('refunded', 300, '2026-10-30T12:00:00.000Z'), // week 44
    entry('charged', 120, '2026-11-01T23:59:59.999Z'), // Sunday 1 Nov, last instant: week 44
    entry('captured', 999, '2026-11-02T00:00:00.000Z'), // the range's end: left out
    // No booking: the job's cutter (plasma) counts. Wednesday 21 Oct: week 43.
    entry('captured', 500, '2026-10-21T10:00:00.000Z', null, j5),
  ])
})

afterAll(() => close())

describe('reports over a hand-made history', () => {
  it('revenue per local ISO week and cutter: captured + fee + charged − refunded', async () => {
    const report = await build('revenue')
    expect(report.rows).toEqual([
      // Week 43 (cutters by name): plasma 500 captured; laser 1000 captured + 250 fee.
      { week: '2026-W43', weekStart: '2026-10-19', cutterId: ids.plasma, cutterName: 'Anvil — plasma table', currency: 'EUR', capturedMinor: 500, feeMinor: 0, chargedMinor: 0, refundedMinor: 0, revenueMinor: 500 },
      { week: '2026-W43', weekStart: '2026-10-19', cutterId: ids.laser, cutterName: 'Heron — CO₂ laser', currency: 'EUR', capturedMinor: 1000, feeMinor: 250, chargedMinor: 0, refundedMinor: 0, revenueMinor: 1250 },
      // Week 44, laser: 700 captured + 120 charged − 300 refunded = 520.
      { week: '2026-W44', weekStart: '2026-10-26', cutterId: ids.laser, cutterName: 'Heron — CO₂ laser', currency: 'EUR', capturedMinor: 700, feeMinor: 0, chargedMinor: 120, refundedMinor: 300, revenueMinor: 520 },
    ])
    expect((await build('revenue', ids.plasma)).rows.map((r) => r.revenueMinor)).toEqual([500])
  })

  it('utilisation of the laser: opening minutes, live job bookings and cut minutes per week', async () => {
    const report = await build('utilisation', ids.laser)
    // Open: Tue–Thu 10:00–20:00 (3 × 600), Fri 10:00–18:00 (480), Sat 10:00–16:00 (360) = 2640 min a week, in wall-clock time.
    // Booked: week 43 = 90 (B1) + 60 (B2 until midnight) = 150; week 44 = 60 (B2 after midnight).
    // Cut: week 43 = 25.5 (J1); week 44 = 40 (J2) + 12 (J3) = 52.
    expect(report.rows).toEqual([
      { week: '2026-W43', weekStart: '2026-10-19', openMinutes: 2640, bookedMinutes: 150, cuttingMinutes: 25.5, bookedPercent: 5.7, cuttingPercent: 1 },
      { week: '2026-W44', weekStart: '2026-10-26', openMinutes: 2640, bookedMinutes: 60, cuttingMinutes: 52, bookedPercent: 2.3, cuttingPercent: 2 },
    ])
  })

  it('utilisation of both cutters adds the plasma table’s hours and cuts', async () => {
    const report = await build('utilisation')
    // Plasma open: Wed and Thu 09:00–17:00 (2 × 480) and Sat 09:00–13:00 (240) = 1200 min; J5's 30 min in week 43.
    expect(report.rows.map((r) => [r.openMinutes, r.bookedMinutes, r.cuttingMinutes])).toEqual([
      [3840, 150, 55.5],
      [3840, 60, 52],
    ])
  })

  it('materials used by the laser’s finished jobs, unknown sheet counts counted apart', async () => {
    const report = await build('materials', ids.laser)
    expect(report.rows.map((r) => ({ name: r.materialName, jobs: r.finishedJobs, sheets: r.sheets, unknown: r.jobsWithoutSheetCount }))).toEqual([
      { name: 'Birch plywood', jobs: 2, sheets: 2, unknown: 1 },
      { name: 'Grey board', jobs: 1, sheets: 1, unknown: 0 },
    ])
  })

  it('minutes by member on the laser: booked minutes inside the range and minutes cut', async () => {
    const report = await build('minutes-by-member', ids.laser)
    expect(report.rows.map((r) => ({ name: r.memberName, bookings: r.bookings, booked: r.bookedMinutes, jobs: r.finishedJobs, cut: r.cutMinutes }))).toEqual([
      { name: 'Juno Castellane', bookings: 1, booked: 120, jobs: 2, cut: 52 },
      { name: 'Ines Halloway', bookings: 1, booked: 90, jobs: 1, cut: 25.5 },
    ])
  })
})
