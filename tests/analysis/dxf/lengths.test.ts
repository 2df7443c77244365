import { describe, expect, it } from 'vitest'
import { analyzeDxf, withDefaults } from '../../../server/analysis/index'
import { ramanujanPerimeter } from '../helpers'
import { arc, circle, dxfDocument, type Group, lwPolyline } from './dxfText'

const MM = 4
const measure = (entities: Group[]) => analyzeDxf(dxfDocument({ insUnits: MM, entities }), withDefaults())
// The engine measures arcs by svg-path-properties' quadrature, good to about 1e-6 relative; the SVG length tests allow 1e-5 too.
const expectLength = (actualMm: number, expectedMm: number) => expect(Math.abs(actualMm / expectedMm - 1)).toBeLessThan(1e-5)

describe('DXF curve lengths against closed forms', () => {
  it('a circle is 2πr and an arc r·θ (the arc-length formula)', () => {
    expectLength(measure(circle(50, 50, 20)).cut.lengthMm, 2 * Math.PI * 20)
    // 30° to 300° counter-clockwise: 270°.
    expectLength(measure(arc(0, 0, 15, 30, 300)).cut.lengthMm, 15 * (3 * Math.PI) / 2)
    // An arc through 0°: 350° to 10° runs 20° counter-clockwise, not 340°.
    expectLength(measure(arc(0, 0, 15, 350, 10)).cut.lengthMm, (15 * Math.PI) / 9)
  })

  it('a bulge b between vertices a chord c apart is an arc of θ = 4·atan(b), radius c / (2·sin(θ/2))', () => {
    // b = 1 is a half circle on the chord; b = tan(π/8) a quarter circle; b = tan(3π/8) three quarters.
    const chordMm = 40
    for (const angleRad of [Math.PI, Math.PI / 2, (3 * Math.PI) / 2, 0.3]) {
      const bulge = Math.tan(angleRad / 4)
      const radius = chordMm / (2 * Math.sin(angleRad / 2))
      const open = measure(lwPolyline([[0, 0, bulge], [chordMm, 0]], false))
      expectLength(open.cut.lengthMm, radius * angleRad)
      // Negative bulge: clockwise, same length, mirrored across the chord.
      const mirrored = measure(lwPolyline([[0, 0, -bulge], [chordMm, 0]], false))
      expectLength(mirrored.cut.lengthMm, radius * angleRad)
      // Bulge > 0 runs counter-clockwise, so from (0,0) to (40,0) it dips below the chord in DXF (Y up): +y in the engine's frame.
      // The box is of the chords, which stay within the 0.01 mm chord tolerance of the arc.
      const sagitta = radius * (1 - Math.cos(angleRad / 2))
      expect(Math.abs(open.bbox.y + open.bbox.height - sagitta)).toBeLessThanOrEqual(0.01)
      expect(Math.abs(mirrored.bbox.y + sagitta)).toBeLessThanOrEqual(0.01)
    }
  })

  it('a closed polyline of two half-circle bulges is a full circle, one pierce', () => {
    const result = measure(lwPolyline([[0, 0, 1], [30, 0, 1]], true))
    expectLength(result.cut.lengthMm, Math.PI * 30)
    expect(result.cut).toMatchObject({ pierces: 1, closedContours: 1, openContours: 0 })
  })

  it('an ellipse measures as Ramanujan’s perimeter (second approximation, 1914)', () => {
    const entities: Group[] = [[0, 'ELLIPSE'], [8, '0'], [10, 0], [20, 0], [30, 0], [11, 0], [21, 40], [31, 0], [40, 0.25], [41, 0], [42, 2 * Math.PI]]
    const result = measure(entities)
    expectLength(result.cut.lengthMm, ramanujanPerimeter(40, 10))
    // The major axis points along DXF +Y: 20 wide, 80 high.
    expect(result.bbox.width).toBeCloseTo(20, 6)
    expect(result.bbox.height).toBeCloseTo(80, 6)
  })

  it('a rational quadratic spline with weights 1, √2/2, 1 is an exact quarter circle (The NURBS Book, §7.3, from memory)', () => {
    const radius = 25
    const entities: Group[] = [
      [0, 'SPLINE'], [8, '0'], [70, 4 | 8], [71, 2], [72, 6], [73, 3],
      [40, 0], [40, 0], [40, 0], [40, 1], [40, 1], [40, 1],
      [41, 1], [41, Math.SQRT1_2], [41, 1],
      [10, radius], [20, 0], [30, 0], [10, radius], [20, radius], [30, 0], [10, 0], [20, radius], [30, 0],
    ]
    const result = measure(entities)
    // Chords inside the curve are shorter; within the 0.01 mm chord tolerance the shortfall is below 1e-4 relative.
    expect(result.cut.lengthMm).toBeLessThanOrEqual((Math.PI * radius) / 2)
    expect(result.cut.lengthMm / ((Math.PI * radius) / 2)).toBeCloseTo(1, 4)
    expect(result.bbox.width).toBeCloseTo(radius, 6)
  })

  it('a clamped cubic spline with one span is its Bézier curve: a straight one measures its chord', () => {
    const entities: Group[] = [
      [0, 'SPLINE'], [8, '0'], [70, 8], [71, 3], [72, 8], [73, 4],
      ...[0, 0, 0, 0, 1, 1, 1, 1].map((knot): Group => [40, knot]),
      ...[0, 10, 20, 30].flatMap((x): Group[] => [[10, x], [20, 2 * x], [30, 0]]),
    ]
    expect(measure(entities).cut.lengthMm).toBeCloseTo(Math.hypot(30, 60), 9)
  })
})
