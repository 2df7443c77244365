import { describe, expect, it } from 'vitest'
import { analyzeDxf, withDefaults } from '../../server/analysis/index'
import { dxfDocument, lwPolyline } from './dxf/dxfText'
import { analyze, mmDocument } from './helpers'

// The decision (server/analysis/README.md, "Operations"): an area is engraved only where the drawing paints an area
// (a fill); a stroke in the engrave colour, closed or open, is marked along its line like a score line. Expected
// lengths and areas are closed forms (a 40 × 20 rectangle: perimeter 120 mm, area 800 mm²).
const ENGRAVE = '#f9a825'

describe('strokes in the engrave colour', () => {
  it('marks a closed outline along its line: 120 mm of line, no area', () => {
    const result = analyze(mmDocument(`<rect x="10" y="10" width="40" height="20" fill="none" stroke="${ENGRAVE}"/>`))
    expect(result.score.lengthMm).toBeCloseTo(120, 9)
    expect(result.engrave.areaMm2).toBe(0)
    expect(result.time.engraveS).toBe(0)
    expect(result.time.scoreS).toBeGreaterThan(0)
  })

  it('marks an open line the same way (no longer free)', () => {
    const result = analyze(mmDocument(`<path d="M10 10H50V30H10" fill="none" stroke="${ENGRAVE}"/>`))
    expect(result.score.lengthMm).toBeCloseTo(100, 9)
    expect(result.engrave.areaMm2).toBe(0)
    expect(result.time.scoreS).toBeGreaterThan(0)
  })

  it('bills closed and open outlines alike: per millimetre of line', () => {
    const closed = analyze(mmDocument(`<path d="M10 10H50V30H10Z" fill="none" stroke="${ENGRAVE}"/>`))
    const open = analyze(mmDocument(`<path d="M10 10H50V30H10V10" fill="none" stroke="${ENGRAVE}"/>`))
    expect(open.score.lengthMm).toBeCloseTo(closed.score.lengthMm, 9)
    expect(open.time.scoreS).toBeCloseTo(closed.time.scoreS, 1)
  })

  it('engraves the area of a filled shape outlined in the engrave colour: 800 mm²', () => {
    const result = analyze(mmDocument(`<rect x="10" y="10" width="40" height="20" fill="${ENGRAVE}" stroke="${ENGRAVE}"/>`))
    expect(result.engrave.areaMm2).toBeCloseTo(800, 9)
    expect(result.score.lengthMm).toBe(0)
  })

  it('marks a closed DXF polyline on an engrave layer along its line', () => {
    const params = withDefaults({ dxfLayerMapping: [{ layer: 'MARK', operation: 'engrave' }] })
    const dxf = dxfDocument({ insUnits: 4, layers: [{ name: 'MARK' }], entities: lwPolyline([[0, 0], [40, 0], [40, 20], [0, 20]], true, [[8, 'MARK']]) })
    const result = analyzeDxf(dxf.replace('8\n0\n8\nMARK', '8\nMARK'), params)
    expect(result.score.lengthMm).toBeCloseTo(120, 9)
    expect(result.engrave.areaMm2).toBe(0)
  })
})
