import { describe, expect, it } from 'vitest'
import type { ApiResponse } from '../../utils/api-types'
import { client, signedIn } from './helpers'

type CatalogOverview = ApiResponse<'/api/catalog/overview'>

const newCutter = (name: string) => ({
  name,
  kind: 'co2-laser',
  bedWidthMm: 600,
  bedHeightMm: 400,
  maxThicknessMm: 6,
  pricePerMinuteMinor: 60,
  currency: 'eur',
  setupMinutes: 5,
  billingIncrementMinutes: 1,
  bookingGranularityMinutes: 15,
  maxSpeedMmPerMin: 24000,
  accelMmPerS2: 2500,
  rapidMmPerMin: 30000,
  junctionDeviationMm: 0.05,
  pierceOverheadS: 0.2,
})

const setting = (cutterId: number, materialId: number, kerfMm = 0.2) => ({
  cutterId,
  materialId,
  cutSpeedMmPerMin: 1000,
  kerfMm,
  pierceS: 0.1,
  minBridgeMm: 3,
  minHoleMm: 1,
  scoreSpeedMmPerMin: 5000,
  engraveSpeedMmPerMin: 15000,
  engraveLineIntervalMm: 0.1,
})

async function materialId(name: string, thicknessMm: number) {
  const member = await signedIn('member@example.test')
  const materials = (await member.get('/api/catalog/materials')).body as { id: number; name: string; thicknessMm: number }[]
  return materials.find((m) => m.name === name && m.thicknessMm === thicknessMm)!.id
}

describe('cutters', () => {
  it('admin creates, staff edits, member reads; currency is normalised to ISO 4217 upper case', async () => {
    const admin = await signedIn('admin@example.test')
    const created = await admin.post('/api/catalog/cutters', newCutter('Wren — desktop laser'))
    expect(created.status).toBe(201)
    expect(created.body.currency).toBe('EUR')

    const staff = await signedIn('staff@example.test')
    const edited = await staff.patch(`/api/catalog/cutters/${created.body.id}`, { notes: 'Lens cleaned weekly', status: 'maintenance' })
    expect(edited.status).toBe(200)
    expect(edited.body.status).toBe('maintenance')

    const member = await signedIn('member@example.test')
    expect((await member.get(`/api/catalog/cutters/${created.body.id}`)).body.notes).toBe('Lens cleaned weekly')
    expect((await member.patch(`/api/catalog/cutters/${created.body.id}`, { notes: 'mine now' })).status).toBe(403)
    expect((await member.post('/api/catalog/cutters', newCutter('Member laser'))).status).toBe(403)
    expect((await client().get('/api/catalog/cutters')).status).toBe(401)
  })

  it('only an admin sets prices', async () => {
    const staff = await signedIn('staff@example.test')
    const cutters = (await staff.get('/api/catalog/cutters')).body as { id: number; pricePerMinuteMinor: number }[]
    const target = cutters[0]!
    const refused = await staff.patch(`/api/catalog/cutters/${target.id}`, { pricePerMinuteMinor: target.pricePerMinuteMinor + 10 })
    expect(refused.status).toBe(403)
    expect(refused.body.message).toMatch(/admin/)
    expect((await staff.get(`/api/catalog/cutters/${target.id}`)).body.pricePerMinuteMinor).toBe(target.pricePerMinuteMinor)
    const admin = await signedIn('admin@example.test')
    expect((await admin.patch(`/api/catalog/cutters/${target.id}`, { pricePerMinuteMinor: target.pricePerMinuteMinor + 10 })).body.pricePerMinuteMinor).toBe(
      target.pricePerMinuteMinor + 10,
    )
  })

  it('rejects a bed of 0 and a negative speed with field messages, and writes nothing', async () => {
    const admin = await signedIn('admin@example.test')
    const before = ((await admin.get('/api/catalog/cutters?includeRetired=true')).body as unknown[]).length
    const response = await admin.post('/api/catalog/cutters', { ...newCutter('Broken'), bedWidthMm: 0, maxSpeedMmPerMin: -5 })
    expect(response.status).toBe(400)
    expect(response.body.data.fields.bedWidthMm).toMatch(/more than 0/)
    expect(response.body.data.fields.maxSpeedMmPerMin).toMatch(/more than 0/)
    expect(((await admin.get('/api/catalog/cutters?includeRetired=true')).body as unknown[]).length).toBe(before)
  })

  it('refuses to delete a cutter with history and deletes one without', async () => {
    const admin = await signedIn('admin@example.test')
    const heron = ((await admin.get('/api/catalog/cutters')).body as { id: number; name: string }[]).find((c) => c.name.startsWith('Heron'))!
    const refused = await admin.delete(`/api/catalog/cutters/${heron.id}`)
    expect(refused.status).toBe(409)
    expect(refused.body.message).toMatch(/retired/)
    expect((await admin.get(`/api/catalog/cutters/${heron.id}`)).status).toBe(200)

    const spare = await admin.post('/api/catalog/cutters', newCutter('Spare bench laser'))
    expect((await admin.delete(`/api/catalog/cutters/${spare.body.id}`)).status).toBe(204)
    expect((await admin.get(`/api/catalog/cutters/${spare.body.id}`)).status).toBe(404)
  })
})

describe('process settings', () => {
  it('refuses a kerf at least as wide as the material is thick', async () => {
    const staff = await signedIn('staff@example.test')
    const admin = await signedIn('admin@example.test')
    const cutter = await admin.post('/api/catalog/cutters', newCutter('Kerf check laser'))
    const board = await materialId('Grey board', 2)
    const response = await staff.post('/api/catalog/process-settings', setting(cutter.body.id, board, 2))
    expect(response.status).toBe(400)
    expect(response.body.data.fields.kerfMm).toMatch(/less than the thickness/)
    expect((await staff.post('/api/catalog/process-settings', setting(cutter.body.id, board, 0.15))).status).toBe(201)
    expect((await staff.post('/api/catalog/process-settings', setting(cutter.body.id, board, 0.15))).status).toBe(409)
  })

  it('refuses a material not allowed on the cutter kind, with the safety reason', async () => {
    const staff = await signedIn('staff@example.test')
    const heron = ((await staff.get('/api/catalog/cutters')).body as { id: number; name: string }[]).find((c) => c.name.startsWith('Heron'))!
    const pvc = await materialId('PVC foam board', 3)
    const response = await staff.post('/api/catalog/process-settings', setting(heron.id, pvc, 0.2))
    expect(response.status).toBe(400)
    expect(response.body.message).toMatch(/chlorine/i)
    expect(response.body.data.reason).toMatch(/Never in a laser/)
  })

  it('a member sees the disallowed pair as not cuttable, with the reason and the cautions', async () => {
    const member = await signedIn('member@example.test')
    const overview = (await member.get<CatalogOverview>('/api/catalog/overview')).body
    const heron = overview.find((c) => c.name.startsWith('Heron'))!
    const pvc = heron.materials.find((m) => m.name === 'PVC foam board')!
    expect(pvc.allowed).toBe(false)
    expect(pvc.cuttable).toBe(false)
    expect(pvc.reason).toMatch(/chlorine/i)
    expect(heron.materials.find((m) => m.name === 'Birch plywood')!.cuttable).toBe(true)
    expect(heron.cautions.map((c) => c.code)).toContain('laser-fire-watch')
    const anvil = overview.find((c) => c.name.startsWith('Anvil'))!
    expect(anvil.cautions.map((c) => c.code)).toContain('plasma-eyes-table')
    expect(anvil.materials.find((m) => m.name === 'Galvanised steel')!.cautions.map((c) => c.code)).toContain('coated-steel-fume')
  })

  it("marks a material thicker than the cutter takes, with the cutter's limit for the page to state in the reader's unit", async () => {
    const admin = await signedIn('admin@example.test')
    const thin = await admin.post('/api/catalog/cutters', { ...newCutter(`Thin-stock laser ${Date.now()}`), maxThicknessMm: 2 })
    expect(thin.status).toBe(201)
    const overview = (await (await signedIn('member@example.test')).get<CatalogOverview>('/api/catalog/overview')).body
    const cutter = overview.find((c) => c.cutterId === thin.body.id)!
    expect(cutter.maxThicknessMm).toBe(2)
    const plywood = cutter.materials.find((m) => m.name === 'Birch plywood' && m.thicknessMm === 3)
    expect(plywood).toMatchObject({ tooThick: true, cuttable: false })
    expect(cutter.materials.find((m) => m.name === 'Grey board' && m.thicknessMm === 2)!.tooThick).toBe(false)
  })
})

describe('materials', () => {
  it('needs a reason when a kind is not allowed, and at least one sheet', async () => {
    const staff = await signedIn('staff@example.test')
    const response = await staff.post('/api/catalog/materials', {
      name: 'Cork sheet',
      family: 'other',
      thicknessMm: 3,
      sheets: [],
      rules: [{ cutterKind: 'plasma', allowed: false, reason: '' }],
    })
    expect(response.status).toBe(400)
    expect(response.body.data.fields.sheets).toMatch(/at least one/)
    expect(response.body.data.fields['rules.0.reason']).toMatch(/reason/)
  })

  it('staff add stock without a price; a sheet price needs an admin', async () => {
    const staff = await signedIn('staff@example.test')
    const body = { name: 'MDF', family: 'wood', thicknessMm: 6, sheets: [{ widthMm: 600, heightMm: 400, priceMinor: 0, currency: 'EUR' }] }
    const created = await staff.post('/api/catalog/materials', body)
    expect(created.status).toBe(201)
    expect(created.body.rules).toHaveLength(4)
    const priced = await staff.patch(`/api/catalog/materials/${created.body.id}`, { sheets: [{ widthMm: 600, heightMm: 400, priceMinor: 350, currency: 'EUR' }] })
    expect(priced.status).toBe(403)
    const admin = await signedIn('admin@example.test')
    const byAdmin = await admin.patch(`/api/catalog/materials/${created.body.id}`, { sheets: [{ widthMm: 600, heightMm: 400, priceMinor: 350, currency: 'EUR' }] })
    expect(byAdmin.body.sheets[0].priceMinor).toBe(350)
  })

  it('reprices a stock sheet that jobs use in place, and refuses staff who touch a price or currency by any route', async () => {
    const admin = await signedIn('admin@example.test')
    const staff = await signedIn('staff@example.test')
    const member = await signedIn('member@example.test')
    const materials = (await member.get('/api/catalog/materials')).body as { id: number; name: string; thicknessMm: number; sheets: { id: number; widthMm: number; heightMm: number; priceMinor: number; currency: string }[] }[]
    const plywood = materials.find((m) => m.name === 'Birch plywood' && m.thicknessMm === 3)!
    const cutters = (await member.get('/api/catalog/cutters')).body as { id: number; name: string }[]
    const job = await member.post('/api/jobs', { title: 'Uses the stock sheet', cutterId: cutters.find((c) => c.name.startsWith('Heron'))!.id, materialId: plywood.id })
    expect(job.status).toBe(201)
    const original = plywood.sheets
    const [first, ...rest] = original
    try {
      // The admin's new price on a sheet a job refers to: the same row, a new price (no 500 from the foreign key).
      const repriced = await admin.patch(`/api/catalog/materials/${plywood.id}`, { sheets: [{ ...first, priceMinor: first!.priceMinor + 10 }, ...rest] })
      expect(repriced.status).toBe(200)
      expect(repriced.body.sheets.map((s: { id: number }) => s.id).sort()).toEqual(original.map((s) => s.id).sort())
      expect(repriced.body.sheets.find((s: { id: number }) => s.id === first!.id).priceMinor).toBe(first!.priceMinor + 10)
      // Sent without ids (an older form), sheets are matched by their exact size.
      const bySize = await admin.patch(`/api/catalog/materials/${plywood.id}`, { sheets: original.map(({ widthMm, heightMm, priceMinor, currency }) => ({ widthMm, heightMm, priceMinor, currency })) })
      expect(bySize.status).toBe(200)
      expect(bySize.body.sheets.find((s: { id: number }) => s.id === first!.id).priceMinor).toBe(first!.priceMinor)
      // A sheet a job uses can't be removed.
      if (rest.length > 0) expect((await admin.patch(`/api/catalog/materials/${plywood.id}`, { sheets: rest })).status).toBe(409)

      // Staff: a nudged size with another sheet's price, a new currency, or a "new" size carrying a price are all refused.
      const other = rest[0] ?? { ...first!, priceMinor: first!.priceMinor + 99 }
      expect((await staff.patch(`/api/catalog/materials/${plywood.id}`, { sheets: [{ ...first, widthMm: first!.widthMm + 1, priceMinor: other.priceMinor }, ...rest] })).status).toBe(403)
      expect((await staff.patch(`/api/catalog/materials/${plywood.id}`, { sheets: [{ ...first, currency: first!.currency === 'EUR' ? 'USD' : 'EUR' }, ...rest] })).status).toBe(403)
      const { id: _id, ...withoutId } = first!
      expect((await staff.patch(`/api/catalog/materials/${plywood.id}`, { sheets: [{ ...withoutId, widthMm: first!.widthMm + 1 }, ...rest] })).status).toBe(403)
      // Staff may change a size, keeping its price and currency.
      const resized = await staff.patch(`/api/catalog/materials/${plywood.id}`, { sheets: [{ ...first, widthMm: first!.widthMm + 1 }, ...rest] })
      expect(resized.status).toBe(200)
      expect((await member.get(`/api/catalog/materials/${plywood.id}`)).body.sheets.find((s: { id: number }) => s.id === first!.id)).toMatchObject({ priceMinor: first!.priceMinor, currency: first!.currency })
    } finally {
      expect((await admin.patch(`/api/catalog/materials/${plywood.id}`, { sheets: original })).status).toBe(200)
    }
  })
})

describe('colours, hours, closures', () => {
  it('validates colour hex and tolerance', async () => {
    const staff = await signedIn('staff@example.test')
    const bad = await staff.post('/api/catalog/colours', { label: 'Odd', hex: 'red', tolerance: 500, operation: 'melt' })
    expect(bad.status).toBe(400)
    expect(Object.keys(bad.body.data.fields).sort()).toEqual(['hex', 'operation', 'tolerance'])
    const good = await staff.post('/api/catalog/colours', { label: 'Pocket', hex: '#1234AB', tolerance: 10, operation: 'engrave' })
    expect(good.status).toBe(201)
    expect(good.body.hex).toBe('#1234ab')
    expect((await staff.post('/api/catalog/colours', { label: 'Again', hex: '#1234ab', tolerance: 10, operation: 'cut' })).status).toBe(409)
  })

  it('replaces opening hours as a whole and refuses overlapping periods', async () => {
    const staff = await signedIn('staff@example.test')
    const anvil = ((await staff.get('/api/catalog/cutters')).body as { id: number; name: string }[]).find((c) => c.name.startsWith('Anvil'))!
    const overlapping = await staff.put(`/api/catalog/cutters/${anvil.id}/hours`, {
      hours: [
        { weekday: 1, opensAt: '09:00', closesAt: '13:00' },
        { weekday: 1, opensAt: '12:00', closesAt: '17:00' },
      ],
    })
    expect(overlapping.status).toBe(400)
    const before = (await staff.get(`/api/catalog/cutters/${anvil.id}/hours`)).body
    expect(before.length).toBeGreaterThan(0)
    const saved = await staff.put(`/api/catalog/cutters/${anvil.id}/hours`, { hours: [{ weekday: 1, opensAt: '09:00', closesAt: '12:00' }, { weekday: 1, opensAt: '13:00', closesAt: '17:00' }] })
    expect(saved.body).toEqual([
      { weekday: 1, opensAt: '09:00', closesAt: '12:00' },
      { weekday: 1, opensAt: '13:00', closesAt: '17:00' },
    ])
    await staff.put(`/api/catalog/cutters/${anvil.id}/hours`, { hours: before })
  })

  it('records a closure only when it ends after it starts', async () => {
    const staff = await signedIn('staff@example.test')
    expect((await staff.post('/api/catalog/closures', { startsAt: '2027-01-02T10:00:00Z', endsAt: '2027-01-02T09:00:00Z', reason: 'Backwards' })).status).toBe(400)
    const ok = await staff.post('/api/catalog/closures', { startsAt: '2027-01-02T10:00:00+01:00', endsAt: '2027-01-02T12:00:00+01:00', reason: 'Extractor filter swap' })
    expect(ok.status).toBe(201)
    expect(ok.body.startsAt).toBe('2027-01-02T09:00:00.000Z')
    expect(((await (await signedIn('member@example.test')).get('/api/catalog/closures')).body as { id: number }[]).some((c) => c.id === ok.body.id)).toBe(true)
  })
})

describe('sign-offs', () => {
  it('staff record and revoke; a member sees their own; a second valid one is refused', async () => {
    const staff = await signedIn('staff@example.test')
    const members = (await staff.get('/api/staff/members')).body as { id: number; email: string }[]
    const priya = members.find((m) => m.email === 'priya@example.test')!
    const anvil = ((await staff.get('/api/catalog/cutters')).body as { id: number; name: string }[]).find((c) => c.name.startsWith('Anvil'))!
    const today = new Date().toISOString().slice(0, 10)

    const future = await staff.post('/api/sign-offs', { userId: priya.id, cutterId: anvil.id, signedOffOn: '2999-01-01' })
    expect(future.status).toBe(400)
    const created = await staff.post('/api/sign-offs', { userId: priya.id, cutterId: anvil.id, signedOffOn: today, note: 'Plasma basics' })
    expect(created.status).toBe(201)
    expect(created.body.valid).toBe(true)
    expect((await staff.post('/api/sign-offs', { userId: priya.id, cutterId: anvil.id, signedOffOn: today })).status).toBe(409)

    const priyaClient = await signedIn('priya@example.test')
    expect(((await priyaClient.get('/api/me/sign-offs')).body as { id: number }[]).map((s) => s.id)).toContain(created.body.id)
    expect((await priyaClient.post('/api/sign-offs', { userId: priya.id, cutterId: anvil.id, signedOffOn: today })).status).toBe(403)

    const revoked = await staff.post(`/api/sign-offs/${created.body.id}/revoke`)
    expect(revoked.body.valid).toBe(false)
    expect((await staff.post(`/api/sign-offs/${created.body.id}/revoke`)).status).toBe(409)
  })

  it('an expired sign-off is not valid', async () => {
    const reuben = await signedIn('reuben@example.test')
    const own = (await reuben.get('/api/me/sign-offs')).body as { valid: boolean; expiresOn: string }[]
    expect(own.length).toBeGreaterThan(0)
    expect(own.every((s) => s.valid === (!s.expiresOn || s.expiresOn >= new Date().toISOString().slice(0, 10)))).toBe(true)
    expect(own.some((s) => !s.valid)).toBe(true)
  })
})
