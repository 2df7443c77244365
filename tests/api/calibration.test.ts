import { beforeAll, describe, expect, it } from 'vitest'
import { plainPart } from '../fixtures/svg'
import { bookingBench, type BookingBench } from './workshop-setup'
import { sqlRows, sqlRow } from './helpers'

let bench: BookingBench

beforeAll(async () => {
  bench = await bookingBench()
})

async function draftWithFile(title: string, copies: number) {
  const job = await bench.member.post('/api/jobs', { title, cutterId: bench.cutterId, materialId: bench.materialId })
  const form = new FormData()
  form.set('file', new Blob([plainPart(60, 40)], { type: 'image/svg+xml' }), 'part.svg')
  form.set('quantity', String(copies))
  await bench.member.form(`/api/jobs/${job.body.id}/files`, form)
  return (await bench.member.get(`/api/jobs/${job.body.id}`)).body
}

describe('estimates that learn from actual minutes', () => {
  it('uses no correction before enough jobs are finished, then recovers a hidden one', async () => {
    const before = await draftWithFile('Before calibration', 20)
    expect(before.estimate.calibration).toBeNull()
    expect(before.estimate.machineS).toBeCloseTo(before.estimate.modelMachineS, 9)

    // Finished jobs whose real cutting ran 25 % slower than the model on every component (a hidden
    // correction written straight into the jobs table, as staff logging would leave it).
    const c = before.estimate.components
    const member = (await sqlRow<{ id: number }>("select id from users where email = 'member@example.test'"))!
    const sheet = (await sqlRow<{ id: number }>('select id from material_sheets where material_id = ?', [bench.materialId]))!
    const insert = (...values: unknown[]) => sqlRows(`insert into jobs (member_id, title, cutter_id, material_id, sheet_id, state, actual_minutes, estimated_cut_s, estimated_pierce_s, estimated_travel_s, estimated_setup_s, cut_finished_at)
      values (?, ?, ?, ?, ?, 'collected', ?, ?, ?, ?, ?, ?)`, values)
    for (let i = 0; i < 12; i++) {
      const copies = 5 + i * 3
      const scale = copies / 20
      const motion = (c.cutS + c.pierceS + c.travelS) * scale
      await insert(member.id, `History ${i}`, bench.cutterId, bench.materialId, sheet.id, (c.setupS + 1.25 * motion) / 60, c.cutS * scale, c.pierceS * scale, c.travelS * scale, c.setupS, new Date(Date.UTC(2026, 5, 1 + i)).toISOString())
    }

    const after = await draftWithFile('After calibration', 20)
    const calibration = after.estimate.calibration
    expect(calibration.calibratedOn).toBe(12)
    const motion = c.cutS + c.pierceS + c.travelS
    // Recovered within 2 %: machine time = setup + 1.25 × the model's motion time.
    expect(after.estimate.machineS).toBeGreaterThan(c.setupS + 1.25 * motion * 0.98)
    expect(after.estimate.machineS).toBeLessThan(c.setupS + 1.25 * motion * 1.02)
    expect(after.estimate.modelMachineS).toBeCloseTo(before.estimate.modelMachineS, 6)
    // The held-out recent jobs were estimated worse before than after.
    expect(calibration.holdOut.corrected.medianPercent).toBeLessThan(calibration.holdOut.uncorrected.medianPercent)
    expect(after.estimate.billableMinutes).toBeGreaterThanOrEqual(before.estimate.billableMinutes)
  })
})
