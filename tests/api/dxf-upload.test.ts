import { describe, expect, it } from 'vitest'
import { dxfDocument, circle, lwPolyline } from '../analysis/dxf/dxfText'
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
})
