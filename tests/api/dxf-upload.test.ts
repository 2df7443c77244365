import { describe, expect, it } from 'vitest'
import { dxfDocument, circle, lwPolyline, type Group } from '../analysis/dxf/dxfText'
import type { CatalogOverview } from './answers'
import { signedIn } from './helpers'

function dxfForm(text: string, filename = 'part.dxf') {
  const form = new FormData()
  form.set('file', new Blob([text], { type: 'image/vnd.dxf' }), filename)
  return form
}

describe('POST /api/analysis with a DXF file', () => {
  it('measures a DXF upload through the real route', async () => {
    const member = await signedIn('member@example.test')
    // A 100 mm square and an r = 20 mm circle in millimetres ($INSUNITS 4).
    const text = dxfDocument({ insUnits: 4, entities: [...lwPolyline([[10, 10], [110, 10], [110, 110], [10, 110]], true), ...circle(60, 60, 20)] })
    const response = await member.form('/api/analysis', dxfForm(text))
    expect(response.status).toBe(200)
    // Perimeter 4 · 100 plus circumference 2πr (closed forms).
    expect(response.body.cut.lengthMm).toBeCloseTo(400 + 2 * Math.PI * 20, 1)
    expect(response.body.cut.pierces).toBe(2)
    // DXF (x, y) is (x, −y) in the result's frame.
    expect(response.body.bbox).toMatchObject({ x: 10, y: -110, width: 100, height: 100 })
  })

  it('answers a damaged DXF with a 4xx and a readable message', async () => {
    const member = await signedIn('member@example.test')
    const text = dxfDocument({ insUnits: 4, entities: circle(0, 0, 5) })
    const truncated = await member.form('/api/analysis', dxfForm(text.slice(0, text.length / 2)))
    expect(truncated.status).toBe(422)
    expect(JSON.stringify(truncated.body)).toMatch(/DXF file is damaged or incomplete/)
    const binary = new FormData()
    binary.set('file', new Blob([new Uint8Array([0x41, 0x75, 0x74, 0x6f, 0xff, 0xfe, 0x00, 0x1a])]), 'part.dxf')
    expect((await member.form('/api/analysis', binary)).status).toBe(415)
  })

  it('takes the operation from the workshop’s DXF layer map', async () => {
    const staff = await signedIn('staff@example.test')
    const mapped = await staff.post('/api/catalog/dxf-layers', { layer: 'Fold-Lines', operation: 'score' })
    expect(mapped.status).toBe(201)
    expect((await staff.post('/api/catalog/dxf-layers', { layer: 'FOLD-LINES', operation: 'cut' })).status).toBe(409)
    expect((await (await signedIn('member@example.test')).post('/api/catalog/dxf-layers', { layer: 'X', operation: 'cut' })).status).toBe(403)
    const overview = (await staff.get<CatalogOverview>('/api/catalog/overview')).body
    const heron = overview.find((c) => c.name.startsWith('Heron'))!
    const ids = { cutterId: heron.cutterId, materialId: heron.materials.find((m) => m.name === 'Birch plywood')!.materialId }
    // A 60 mm fold line on the mapped layer (matched without regard to case) beside a cut outline.
    const foldLine: Group[] = [[0, 'LINE'], [8, 'FOLD-LINES'], [10, 20], [20, 50], [30, 0], [11, 80], [21, 50], [31, 0]]
    const text = dxfDocument({ insUnits: 4, layers: [{ name: 'FOLD-LINES' }], entities: [...lwPolyline([[10, 10], [90, 10], [90, 90], [10, 90]], true), ...foldLine] })
    const form = dxfForm(text)
    form.set('cutterId', String(ids.cutterId))
    form.set('materialId', String(ids.materialId))
    const response = await staff.form('/api/analysis', form)
    expect(response.status).toBe(200)
    expect(response.body.score.lengthMm).toBeCloseTo(60, 6)
    expect(response.body.cut.lengthMm).toBeCloseTo(320, 6)
    expect((await staff.delete(`/api/catalog/dxf-layers/${mapped.body.id}`)).status).toBe(204)
  })
})
