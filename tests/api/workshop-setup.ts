// Builds what booking tests need through the API: a cutter open every day, a process setting,
// a member signed off on it, and approved jobs ready to book.
import { DateTime } from 'luxon'
import { plainPart } from '../fixtures/svg'
import { signedIn } from './helpers'

export type Client = Awaited<ReturnType<typeof signedIn>>

export interface BookingBench {
  admin: Client
  staff: Client
  member: Client
  cutterId: number
  materialId: number
  zone: string
  approvedJob: (title?: string, by?: Client) => Promise<number>
  /** An instant `days` from today at `clock` in the workshop's zone, as UTC ISO. */
  at: (days: number, clock: string) => string
}

let counter = 0

/** Against the tests' server, or the one at `baseUrl` (a test that starts a server of its own). */
export async function bookingBench(baseUrl?: string): Promise<BookingBench> {
  const admin = await signedIn('admin@example.test', undefined, baseUrl)
  const staff = await signedIn('staff@example.test', undefined, baseUrl)
  const member = await signedIn('member@example.test', undefined, baseUrl)
  const name = `Bench laser ${Date.now()}-${++counter}`
  const cutter = await admin.post('/api/catalog/cutters', {
    name, kind: 'co2-laser', bedWidthMm: 1000, bedHeightMm: 600, maxThicknessMm: 8, pricePerMinuteMinor: 100, currency: 'EUR',
    setupMinutes: 5, billingIncrementMinutes: 1, bookingGranularityMinutes: 15, maxSpeedMmPerMin: 20000, accelMmPerS2: 2000,
    rapidMmPerMin: 30000, junctionDeviationMm: 0.05, pierceOverheadS: 0.2,
  })
  if (cutter.status !== 201) throw new Error(`cutter: ${JSON.stringify(cutter.body)}`)
  const cutterId = cutter.body.id as number
  const materials = (await staff.get('/api/catalog/materials')).body as { id: number; name: string; thicknessMm: number }[]
  const materialId = materials.find((m) => m.name === 'Birch plywood' && m.thicknessMm === 3)!.id
  await staff.post('/api/catalog/process-settings', {
    cutterId,
    materialId,
    cutSpeedMmPerMin: 1200,
    kerfMm: 0.2,
    pierceS: 0.1,
    minBridgeMm: 3,
    minHoleMm: 1,
    scoreSpeedMmPerMin: 6000,
    engraveSpeedMmPerMin: 18000,
    engraveLineIntervalMm: 0.1,
  })
  await staff.put(`/api/catalog/cutters/${cutterId}/hours`, { hours: [1, 2, 3, 4, 5, 6, 7].map((weekday) => ({ weekday, opensAt: '08:00', closesAt: '20:00' })) })
  const members = (await staff.get('/api/staff/members')).body as { id: number; email: string }[]
  const memberId = members.find((m) => m.email === 'member@example.test')!.id
  await staff.post('/api/sign-offs', { userId: memberId, cutterId, signedOffOn: '2026-01-05' })
  const zone = ((await member.get('/api/settings')).body as { timeZone: string }).timeZone

  async function approvedJob(title = 'Bench job', by: Client = member): Promise<number> {
    const job = await by.post('/api/jobs', { title, cutterId, materialId })
    const form = new FormData()
    form.set('file', new Blob([plainPart()], { type: 'image/svg+xml' }), 'part.svg')
    await by.form(`/api/jobs/${job.body.id}/files`, form)
    await by.post(`/api/jobs/${job.body.id}/submit`, {})
    const approved = await staff.post(`/api/jobs/${job.body.id}/approve`, {})
    if (approved.status !== 200) throw new Error(`approve: ${JSON.stringify(approved.body)}`)
    return job.body.id
  }

  const at = (days: number, clock: string) => {
    const [hour, minute] = clock.split(':').map(Number)
    return DateTime.now().setZone(zone).plus({ days }).set({ hour, minute, second: 0, millisecond: 0 }).toUTC().toISO()!
  }
  return { admin, staff, member, cutterId, materialId, zone, approvedJob, at }
}
