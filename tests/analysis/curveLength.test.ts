import { Bezier } from 'bezier-js'
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { arcLengthMm, cubicLengthMm, quadraticLengthMm } from '../../server/analysis/curveLength'
import { PROPERTY_TIMEOUT_MS, ramanujanPerimeter } from './helpers'

/**
 * Closed form for a cubic whose control points lie on one line (values v0…v3 along it): the curve runs to and fro
 * along the line, so its length is Σ |v(tᵢ₊₁) − v(tᵢ)| over [0, 1] split at the roots of v′(t) (a quadratic,
 * solved by the quadratic formula) — calculus, independent of any quadrature.
 */
function lineCubicLength(v0: number, v1: number, v2: number, v3: number): number {
  const value = (t: number) => (1 - t) ** 3 * v0 + 3 * (1 - t) ** 2 * t * v1 + 3 * (1 - t) * t * t * v2 + t ** 3 * v3
  // v′(t)/3 = a·t² + b·t + c.
  const a = v3 - 3 * v2 + 3 * v1 - v0
  const b = 2 * (v2 - 2 * v1 + v0)
  const c = v1 - v0
  const roots: number[] = []
  if (a === 0) {
    if (b !== 0) roots.push(-c / b)
  } else {
    // The quadratic formula in the form without cancellation (Numerical Recipes §5.6): q = −(b + sgn(b)√D)/2, roots q/a and c/q.
    const discriminant = b * b - 4 * a * c
    const q = -(b + (b < 0 ? -1 : 1) * Math.sqrt(discriminant)) / 2
    if (discriminant > 0) roots.push(q / a, c / q)
  }
  const stops = [0, ...roots.filter((t) => t > 0 && t < 1).sort((x, y) => x - y), 1]
  let length = 0
  for (let index = 1; index < stops.length; index++) length += Math.abs(value(stops[index]!) - value(stops[index - 1]!))
  return length
}

/**
 * Parabola arc length: a quadratic Bézier has B′(t) = 2[(P0 − 2P1 + P2)t + (P1 − P0)], so its length is
 * ∫₀¹ √(At² + Bt + C) dt with the standard table antiderivative of √(at² + bt + c) (for 4AC − B² > 0):
 * (2At + B)√(…)/(4A) + (4AC − B²)/(8A^{3/2}) · ln(2√A·√(…) + 2At + B).
 */
function parabolaLength(x0: number, y0: number, x1: number, y1: number, x2: number, y2: number): number {
  const ax = x0 - 2 * x1 + x2
  const ay = y0 - 2 * y1 + y2
  const bx = x1 - x0
  const by = y1 - y0
  const A = 4 * (ax * ax + ay * ay)
  const B = 8 * (ax * bx + ay * by)
  const C = 4 * (bx * bx + by * by)
  const antiderivative = (t: number) => {
    const root = Math.sqrt(A * t * t + B * t + C)
    return ((2 * A * t + B) * root) / (4 * A) + ((4 * A * C - B * B) / (8 * A ** 1.5)) * Math.log(2 * Math.sqrt(A) * root + 2 * A * t + B)
  }
  return antiderivative(1) - antiderivative(0)
}

// x0, y0 … x3, y3 of a cubic.
type CubicCoordinates = [number, number, number, number, number, number, number, number]

const coordinate = fc.double({ min: -300, max: 300, noNaN: true })

describe('curve length', () => {
  // The cusp the issue reports: 1-D, so the closed form above applies. Worked out by hand as well: x′ = 0 at
  // t ≈ 0.33619 and 0.97512, where x ≈ 115.8014 and 12.5883, so 115.8014 + 103.2131 + 0.4817 = 219.4961 mm.
  it('measures the cusp cubic (0,0)(259.45,0)(0,0)(13.07,0) as its closed form, 219.4961 mm', () => {
    const expected = lineCubicLength(0, 259.45, 0, 13.07)
    expect(expected).toBeCloseTo(219.4961, 4)
    expect(cubicLengthMm(0, 0, 259.45, 0, 0, 0, 13.07, 0)).toBeCloseTo(expected, 9)
  })

  it('measures cubics along a line, turning back or not, as the closed form (random lines and directions)', () => {
    const fourCoordinates = fc.array(coordinate, { minLength: 4, maxLength: 4 })
    const anyAngle = fc.double({ min: 0, max: 2 * Math.PI, noNaN: true })
    fc.assert(
      fc.property(fourCoordinates, anyAngle, coordinate, coordinate, (values, angle, originX, originY) => {
        const [ux, uy] = [Math.cos(angle), Math.sin(angle)]
        const [x0, y0, x1, y1, x2, y2, x3, y3] = values.flatMap((value) => [originX + value * ux, originY + value * uy]) as CubicCoordinates
        const expected = lineCubicLength(values[0]!, values[1]!, values[2]!, values[3]!)
        expect(Math.abs(cubicLengthMm(x0, y0, x1, y1, x2, y2, x3, y3) - expected)).toBeLessThanOrEqual(1e-9 * (1 + expected))
      }),
      { numRuns: 400 },
    )
  }, PROPERTY_TIMEOUT_MS)

  // Seed 582422631's counterexample of the old method, a 1-D cusp too.
  it('measures the shrunk counterexample (0,0)(84.09,0)(3.19,0)(0,0) as its closed form', () => {
    expect(cubicLengthMm(0, 0, 84.0899666995, 0, 3.1935603125, 0, 0, 0)).toBeCloseTo(lineCubicLength(0, 84.0899666995, 3.1935603125, 0), 9)
  })

  it('measures quadratics as the parabola length formula', () => {
    fc.assert(
      fc.property(fc.array(coordinate, { minLength: 6, maxLength: 6 }), (coordinates) => {
        const [x0, y0, x1, y1, x2, y2] = coordinates as [number, number, number, number, number, number]
        // The formula needs a true parabola: control points well off one line.
        const twiceArea = Math.abs((x1 - x0) * (y2 - y0) - (x2 - x0) * (y1 - y0))
        fc.pre(twiceArea > 1e-3 * ((x2 - x0) ** 2 + (y2 - y0) ** 2 + (x1 - x0) ** 2 + (y1 - y0) ** 2) && twiceArea > 1)
        const expected = parabolaLength(x0, y0, x1, y1, x2, y2)
        expect(Math.abs(quadraticLengthMm(x0, y0, x1, y1, x2, y2) / expected - 1)).toBeLessThan(1e-9)
      }),
      { numRuns: 400 },
    )
  }, PROPERTY_TIMEOUT_MS)

  // Independent package: bezier-js 6.1.4 measures with its own 24-point Legendre–Gauss rule, accurate on smooth curves (no cusp).
  it.each([
    [0, 0, 30, 80, 120, 90, 160, 10],
    [10, 10, 200, 10, 10, 200, 200, 200],
    [0, 0, 50, 0, 100, 50, 100, 100],
    [2.5, 4, 2.5, 2.8, 5, 2.8, 5, 4],
  ])('matches bezier-js on the smooth cubic %#', (...c) => {
    const expected = new Bezier(c[0], c[1], c[2], c[3], c[4], c[5], c[6], c[7]).length()
    expect(cubicLengthMm(c[0], c[1], c[2], c[3], c[4], c[5], c[6], c[7]) / expected).toBeCloseTo(1, 8)
  })

  // A circle's arc is r·θ (definition of the radian); arcs are built from a centre, radius, start and swept angle.
  it('measures circular arcs as r·θ', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.01, max: 500, noNaN: true }),
        fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }),
        fc.double({ min: 0.001, max: 2 * Math.PI - 0.001, noNaN: true }),
        fc.boolean(),
        fc.double({ min: -180, max: 180, noNaN: true }),
        (radius, startAngle, sweptAngle, clockwise, rotationDeg) => {
          const direction = clockwise ? -1 : 1
          const endAngle = startAngle + direction * sweptAngle
          const [x0, y0] = [10 + radius * Math.cos(startAngle), 20 + radius * Math.sin(startAngle)]
          const [x, y] = [10 + radius * Math.cos(endAngle), 20 + radius * Math.sin(endAngle)]
          // The rotation of a circle changes nothing (SVG 1.1 F.6.2); positive angles are the sweep flag's direction.
          const measured = arcLengthMm(x0, y0, radius, radius, rotationDeg, sweptAngle > Math.PI, !clockwise, x, y)
          expect(Math.abs(measured / (radius * sweptAngle) - 1)).toBeLessThan(1e-6)
        },
      ),
      { numRuns: 400 },
    )
  }, PROPERTY_TIMEOUT_MS)

  it('follows the SVG arc rules for zero radii, radii too small and an arc that ends where it starts', () => {
    // SVG 1.1 F.6.2: a zero radius is a straight line; F.6.6: radii too small grow to a half ellipse through both ends.
    expect(arcLengthMm(0, 0, 0, 5, 0, false, true, 3, 4)).toBe(5)
    expect(arcLengthMm(0, 0, 1, 1, 0, false, true, 10, 0)).toBeCloseTo(5 * Math.PI, 12)
    expect(arcLengthMm(3, 3, 5, 5, 0, true, true, 3, 3)).toBe(0)
  })

  // A full ellipse as two half arcs: Ramanujan's second approximation (1914), whose own error is below 2e-5 relative down to b/a = 1/12.
  it.each([
    [40, 10, 0],
    [100, 99, 30],
    [60, 5, -75],
  ])('measures an ellipse with semi-axes %f and %f mm (turned %f°) as Ramanujan', (rx, ry, rotationDeg) => {
    const turn = (rotationDeg * Math.PI) / 180
    const [ex, ey] = [rx * Math.cos(turn), rx * Math.sin(turn)]
    const halves = arcLengthMm(-ex, -ey, rx, ry, rotationDeg, false, true, ex, ey) + arcLengthMm(ex, ey, rx, ry, rotationDeg, false, true, -ex, -ey)
    expect(Math.abs(halves / ramanujanPerimeter(rx, ry) - 1)).toBeLessThan(5e-5)
  })

  // A quarter of an ellipse is a·E(m), E the complete elliptic integral of the second kind with parameter
  // m = 1 − b²/a²; for a = 2b, E(3/4) = 1.21105602756846 (computed with Python's mpmath, ellipe(0.75), at 15 digits).
  it('measures a quarter ellipse as a·E(k)', () => {
    expect(arcLengthMm(20, 0, 20, 10, 0, false, true, 0, 10)).toBeCloseTo(20 * 1.2110560276, 8)
  })
})
