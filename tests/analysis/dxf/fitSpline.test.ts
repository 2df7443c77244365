import { describe, expect, it } from 'vitest'
import { analyzeDxf, withDefaults } from '../../../server/analysis/index'
import { groupOf } from '../sites'
import { dxfDocument, type Group } from './dxfText'

// DXF reference, SPLINE: a spline may be given by fit points (11/21) only, with optional start and end tangents
// (12/22, 13/23) and flag 70 bit 1 for closed; the curve passes through its fit points. Expected lengths are closed
// forms of the circle the fit points are taken from (2πR, πR/2); a cubic interpolant of n points on a circle is within
// O((2π/n)⁴) of it, while the straight chords through the same points fall short by 1 − sin(π/n)/(π/n) (1.1 % at 12).
const params = withDefaults({ colourMapping: [{ hex: '#ffffff', toleranceRgbDistance: 0, operation: 'cut' }] })
const analyse = (entities: Group[]) => analyzeDxf(dxfDocument({ insUnits: 4, entities }), params)

function fitSpline(points: Array<[number, number]>, options: { closed?: boolean; start?: [number, number]; end?: [number, number] } = {}): Group[] {
  return [
    [0, 'SPLINE'], [8, '0'], [70, options.closed ? 11 : 8], [71, 3], [72, 0], [73, 0], [74, points.length],
    ...(options.start ? ([[12, options.start[0]], [22, options.start[1]], [32, 0]] as Group[]) : []),
    ...(options.end ? ([[13, options.end[0]], [23, options.end[1]], [33, 0]] as Group[]) : []),
    ...points.flatMap(([x, y]): Group[] => [[11, x], [21, y], [31, 0]]),
  ]
}

const onCircle = (radius: number, count: number, fromRad: number, toRad: number): Array<[number, number]> =>
  Array.from({ length: count }, (_, i) => {
    const angle = fromRad + ((toRad - fromRad) * i) / (count - 1)
    return [radius * Math.cos(angle), radius * Math.sin(angle)]
  })

describe('a SPLINE given only by fit points', () => {
  it('closed through 12 points of a circle of radius 50: length 2πR within 0.05 %, box 100 × 100, one closed contour', () => {
    const points = onCircle(50, 13, 0, 2 * Math.PI).slice(0, 12)
    const result = analyse(fitSpline(points, { closed: true }))
    expect(Math.abs(result.cut.lengthMm / (2 * Math.PI * 50) - 1)).toBeLessThan(5e-4)
    expect(result.cut.closedContours).toBe(1)
    expect(result.bbox.width).toBeGreaterThan(99.5)
    expect(result.bbox.width).toBeLessThan(100.5)
    expect(groupOf(result, 'dxf-spline-fit-points')).toBeUndefined()
  })

  it('open quarter circle through 5 points with its tangents given: length πR/2 within 0.05 %', () => {
    const points = onCircle(40, 5, 0, Math.PI / 2)
    const result = analyse(fitSpline(points, { start: [0, 1], end: [-1, 0] }))
    expect(Math.abs(result.cut.lengthMm / ((Math.PI * 40) / 2) - 1)).toBeLessThan(5e-4)
    expect(result.cut.openContours).toBe(1)
  })

  it('passes through its fit points: through (0,0), (10,10), (20,0) it reaches y = 10', () => {
    const result = analyse(fitSpline([[0, 0], [10, 10], [20, 0]]))
    // The engine's frame has y down: world y 0…10 is −10…0 mm.
    expect(result.bbox.y).toBeCloseTo(-10, 6)
    expect(result.bbox.height).toBeCloseTo(10, 6)
    // Longer than the two chords (2·√200), as a curve through them is.
    expect(result.cut.lengthMm).toBeGreaterThan(2 * Math.sqrt(200))
  })

  it('is the straight line when its fit points are on one', () => {
    expect(analyse(fitSpline([[0, 0], [3, 4], [6, 8], [9, 12]])).cut.lengthMm).toBeCloseTo(15, 9)
  })
})
