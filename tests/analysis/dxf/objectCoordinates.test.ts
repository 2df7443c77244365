import { describe, expect, it } from 'vitest'
import { objectAxes } from '../../../server/analysis/dxf/readDxf'
import { analyzeDxf, withDefaults } from '../../../server/analysis/index'
import { ramanujanPerimeter } from '../helpers'
import { groupOf, sitesOf } from '../sites'
import { arc, circle, dxfDocument, type Group, line, lwPolyline } from './dxfText'

// Expected places follow the DXF reference, "Object Coordinate Systems (OCS)" and "Arbitrary Axis Algorithm":
// LINE points are world coordinates; CIRCLE, ARC, LWPOLYLINE are in the OCS of their extrusion direction, whose X axis is
// Wy × N (|Nx|, |Ny| < 1/64), so N = (0, 0, −1) gives Ax = (−1, 0, 0), Ay = (0, 1, 0): OCS (x, y) is world (−x, y);
// an ELLIPSE has world centre and major axis and runs counter-clockwise about N (minor axis N × major · ratio).
// The engine's frame puts world (x, y) at (x, −y) mm.
const MM = 4
const params = withDefaults({ thicknessMm: 3, kerfMm: 0.2, colourMapping: [{ hex: '#ffffff', toleranceRgbDistance: 0, operation: 'cut' }] })
const DOWN: Group[] = [[210, 0], [220, 0], [230, -1]]
const analyse = (entities: Group[]) => analyzeDxf(dxfDocument({ insUnits: MM, entities }), params)
const TOLERANCE_MM = 0.02

function expectBox(result: ReturnType<typeof analyse>, x: number, y: number, width: number, height: number) {
  expect(Math.abs(result.bbox.x - x)).toBeLessThan(TOLERANCE_MM)
  expect(Math.abs(result.bbox.y - y)).toBeLessThan(TOLERANCE_MM)
  expect(Math.abs(result.bbox.width - width)).toBeLessThan(TOLERANCE_MM)
  expect(Math.abs(result.bbox.height - height)).toBeLessThan(TOLERANCE_MM)
}

describe('the arbitrary axis algorithm', () => {
  it('gives the reference axes for +Z, −Z and a non-unit −Z', () => {
    expect(objectAxes({ x: 0, y: 0, z: 1 })).toEqual([1, 0, -0, 1, 0, 0].map((value) => value + 0))
    for (const z of [-1, -2.5]) expect(objectAxes({ x: 0, y: 0, z })!.map((value) => value + 0)).toEqual([-1, 0, 0, 1, 0, 0])
    expect(objectAxes({ x: 0.6, y: 0, z: 0.8 })).toBeUndefined()
  })
})

describe('DXF entities with extrusion (0, 0, −1)', () => {
  it('does not mirror a LINE (its points are world coordinates)', () => {
    const result = analyse(line(10, 5, 30, 5, DOWN))
    expectBox(result, 10, -5, 20, 0)
    expect(result.cut.lengthMm).toBeCloseTo(20, 9)
  })

  it('draws a LINE with a tilted extrusion where its world points are', () => {
    const result = analyse(line(10, 5, 30, 5, [[210, 0.6], [220, 0], [230, 0.8]]))
    expectBox(result, 10, -5, 20, 0)
    expect(groupOf(result, 'dxf-not-planar')).toBeUndefined()
  })

  it('places a CIRCLE at OCS (x, y) = world (−x, y), with length 2πr', () => {
    const result = analyse(circle(20, 10, 5, DOWN))
    expectBox(result, -25, -15, 10, 10)
    expect(Math.abs(result.cut.lengthMm - 2 * Math.PI * 5)).toBeLessThan(TOLERANCE_MM)
  })

  it('places an ARC the same way (0° to 90° about OCS (10, 0), r 5: world x −15…−10, y 0…5)', () => {
    const result = analyse(arc(10, 0, 5, 0, 90, DOWN))
    expectBox(result, -15, -5, 5, 5)
    expect(Math.abs(result.cut.lengthMm - (Math.PI * 5) / 2)).toBeLessThan(TOLERANCE_MM)
  })

  it('keeps a mirrored hole inside its mirrored part (a 50 × 30 plate and a Ø2 hole, both in the OCS of −Z)', () => {
    const plate = lwPolyline([[0, 0], [50, 0], [50, 30], [0, 30]], true, DOWN)
    const result = analyse([...plate, ...circle(10, 15, 1, DOWN)])
    expectBox(result, -50, -30, 50, 30)
    const [hole, ...rest] = sitesOf(result, 'small-hole')
    expect(rest).toEqual([])
    // The hole's middle: OCS (10, 15) → world (−10, 15) → engine (−10, −15); its diameter 2r.
    expect(hole!.x).toBeCloseTo(-10, 3)
    expect(hole!.y).toBeCloseTo(-15, 3)
    expect(hole!.valueMm!).toBeCloseTo(2, 3)
  })

  it('runs a half ELLIPSE about its extrusion: t from 0 to π goes below the major axis for −Z, above it for +Z', () => {
    // Centre (0, 0), major axis (10, 0), ratio 0.5: minor axis N × (10, 0, 0) · 0.5 = (0, −5, 0) for N = −Z.
    const ellipse = (extra: Group[]): Group[] => [[0, 'ELLIPSE'], [8, '0'], [10, 0], [20, 0], [30, 0], [11, 10], [21, 0], [31, 0], [40, 0.5], [41, 0], [42, Math.PI], ...extra]
    const down = analyse(ellipse(DOWN))
    const up = analyse(ellipse([]))
    // World y from −5 to 0 is engine y from 0 to 5; for +Z world y from 0 to 5 is engine −5 to 0.
    expectBox(down, -10, 0, 20, 5)
    expectBox(up, -10, -5, 20, 5)
    // Half the perimeter (Ramanujan's second approximation, relative error ~1e-10 at this ratio).
    for (const result of [down, up]) expect(Math.abs(result.cut.lengthMm - ramanujanPerimeter(10, 5) / 2)).toBeLessThan(TOLERANCE_MM)
  })

  it('places a full ELLIPSE with −Z by its world centre', () => {
    const ellipse: Group[] = [[0, 'ELLIPSE'], [8, '0'], [10, 30], [20, 10], [30, 0], [11, 10], [21, 0], [31, 0], [40, 0.5], [41, 0], [42, 2 * Math.PI], ...DOWN]
    expectBox(analyse(ellipse), 20, -15, 20, 10)
  })

  it('reports a CIRCLE in a tilted plane as not planar instead of drawing it', () => {
    const result = analyse([...circle(20, 10, 5, [[210, 0.6], [220, 0], [230, 0.8]]), ...line(0, 0, 10, 0)])
    expect(result.cut.lengthMm).toBeCloseTo(10, 9)
    expect(groupOf(result, 'dxf-not-planar')).toMatchObject({ count: 1 })
  })
})
