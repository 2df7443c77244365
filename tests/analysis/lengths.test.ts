import { Bezier } from 'bezier-js'
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { analyze, CUT, cutPath, mmDocument, PROPERTY_TIMEOUT_MS, ramanujanPerimeter } from './helpers'

describe('lengths and areas against closed forms', () => {
  // Circumference 2πr (Euclid/Archimedes closed form).
  it.each([0.5, 3, 25, 140])('a circle of radius %f mm is 2πr long and one closed contour', (r) => {
    const result = analyze(mmDocument(`<circle cx="250" cy="250" r="${r}" fill="none" stroke="${CUT}"/>`))
    expect(result.cut.lengthMm / (2 * Math.PI * r)).toBeCloseTo(1, 5)
    expect(result.cut).toMatchObject({ pierces: 1, closedContours: 1, openContours: 0 })
  })

  // Ellipse perimeter: Ramanujan's second approximation; its own error stays below about 2e-5 relative down to b/a = 1/12 (from memory).
  it.each([
    [40, 10],
    [100, 99],
    [60, 5],
  ])('an ellipse with semi-axes %f and %f mm matches Ramanujan', (rx, ry) => {
    const result = analyze(mmDocument(`<ellipse cx="250" cy="250" rx="${rx}" ry="${ry}" fill="none" stroke="${CUT}"/>`))
    expect(Math.abs(result.cut.lengthMm / ramanujanPerimeter(rx, ry) - 1)).toBeLessThan(5e-5)
  })

  // A quarter arc of radius r is πr/2 long (2πr / 4).
  it('measures a quarter arc as πr/2', () => {
    expect(analyze(mmDocument(cutPath('M100 0A100 100 0 0 1 0 100'))).cut.lengthMm).toBeCloseTo((Math.PI * 100) / 2, 3)
  })

  // SVG 1.1 §9.2: a rect with rx = ry = r has four quarter-circle corners: perimeter 2(w + h) − 8r + 2πr.
  it('measures rounded rect corners', () => {
    const result = analyze(mmDocument(`<rect x="10" y="10" width="80" height="40" rx="5" fill="none" stroke="${CUT}"/>`))
    expect(result.cut.lengthMm).toBeCloseTo(2 * (80 + 40) - 8 * 5 + 2 * Math.PI * 5, 3)
  })

  // Shoelace formula: area of a simple polygon = ½|Σ(xᵢyᵢ₊₁ − xᵢ₊₁yᵢ)|, computed here independently of the engine.
  it('engraves the shoelace area of random polygons drawn as fills', () => {
    const polarPoint = fc.tuple(fc.double({ min: 0, max: 1, noNaN: true }), fc.double({ min: 1, max: 100, noNaN: true }))
    fc.assert(
      fc.property(fc.array(polarPoint, { minLength: 3, maxLength: 30 }), (polar) => {
        // Points sorted by angle around a centre form a star-shaped, simple polygon.
        const points = polar
          .map(([turn, radius]) => [turn * 2 * Math.PI, radius] as const)
          .sort((a, b) => a[0] - b[0])
          .map(([angle, radius]) => [250 + radius * Math.cos(angle), 250 + radius * Math.sin(angle)] as const)
        let twiceArea = 0
        points.forEach(([x, y], index) => {
          const [nextX, nextY] = points[(index + 1) % points.length]!
          twiceArea += x * nextY - nextX * y
        })
        fc.pre(Math.abs(twiceArea) > 2)
        const svg = mmDocument(`<polygon points="${points.map((point) => point.join(',')).join(' ')}" fill="#f9a825"/>`)
        expect(analyze(svg).engrave.areaMm2).toBeCloseTo(Math.abs(twiceArea) / 2, 6)
      }),
      { numRuns: 60 },
    )
  }, PROPERTY_TIMEOUT_MS)

  // SVG 1.1 §11.3 fill rules: with evenodd an inner square drawn the same way round is a hole; with nonzero it is filled over.
  it('subtracts holes by fill rule', () => {
    const squares = 'M0 0H100V100H0Z M25 25H75V75H25Z'
    expect(analyze(mmDocument(`<path d="${squares}" fill="#f9a825" fill-rule="evenodd"/>`)).engrave.areaMm2).toBeCloseTo(10000 - 2500, 6)
    expect(analyze(mmDocument(`<path d="${squares}" fill="#f9a825"/>`)).engrave.areaMm2).toBeCloseTo(10000, 6)
    const reversedInner = 'M0 0H100V100H0Z M25 25V75H75V25Z'
    expect(analyze(mmDocument(`<path d="${reversedInner}" fill="#f9a825"/>`)).engrave.areaMm2).toBeCloseTo(10000 - 2500, 6)
  })

  // Independent package: bezier-js 6.1.4 measures cubic length by its own Legendre–Gauss quadrature (smooth curves, no cusp).
  it.each([
    [0, 0, 30, 80, 120, 90, 160, 10],
    [10, 10, 200, 10, 10, 200, 200, 200],
    [0, 0, 50, 0, 100, 50, 100, 100],
  ])('matches bezier-js on the cubic %#', (...c) => {
    const expected = new Bezier(c[0], c[1], c[2], c[3], c[4], c[5], c[6], c[7]).length()
    const measured = analyze(mmDocument(cutPath(`M${c[0]} ${c[1]}C${c[2]} ${c[3]} ${c[4]} ${c[5]} ${c[6]} ${c[7]}`))).cut.lengthMm
    expect(measured / expected).toBeCloseTo(1, 8)
  })

  // Seed 582422631 made the curve-length method before adaptive quadrature fail at a cusp: kept as a regression.
  it.each([
    ['the run seed', undefined],
    ['seed 582422631', 582_422_631],
  ])('keeps random cubic Béziers between the proven bounds of their length (%s)', (_, seed) => {
    const coordinate = fc.double({ min: 0, max: 400, noNaN: true })
    fc.assert(
      fc.property(fc.array(coordinate, { minLength: 8, maxLength: 8 }), (c) => {
        const { lowerMm, upperMm } = cubicLengthBounds(c, 1000)
        fc.pre(lowerMm > 1)
        const measured = analyze(mmDocument(cutPath(`M${c[0]} ${c[1]}C${c[2]} ${c[3]} ${c[4]} ${c[5]} ${c[6]} ${c[7]}`))).cut.lengthMm
        expect(measured).toBeGreaterThanOrEqual(lowerMm * (1 - 1e-12))
        expect(measured).toBeLessThanOrEqual(upperMm * (1 + 1e-12))
      }),
      { numRuns: 60, ...(seed === undefined ? {} : { seed }) },
    )
    // 60 analyses with 1000-piece references take about a second; a loaded machine can take many times that.
  }, 60_000)
})

/**
 * Proven bounds on a cubic Bézier's length from `pieces` equal parameter steps: no curve is shorter than its
 * chords (triangle inequality), and no Bézier piece is longer than its control polygon (|B′| ≤ n·Σ|ΔPᵢ|·bᵢ,ₙ₋₁(t)
 * and each Bernstein polynomial integrates to 1/n). A piece's control points are the blossom values
 * b(t0,t0,t0), b(t0,t0,t1), b(t0,t1,t1), b(t1,t1,t1) (de Casteljau with the parameters in turn).
 */
function cubicLengthBounds(c: number[], pieces: number): { lowerMm: number; upperMm: number } {
  const blossom = (u: number, v: number, w: number, axis: number) => {
    let points = [c[axis]!, c[axis + 2]!, c[axis + 4]!, c[axis + 6]!]
    for (const t of [u, v, w]) points = points.slice(1).map((point, index) => (1 - t) * points[index]! + t * point)
    return points[0]!
  }
  const point = (u: number, v: number, w: number) => [blossom(u, v, w, 0), blossom(u, v, w, 1)] as const
  let lowerMm = 0
  let upperMm = 0
  for (let piece = 0; piece < pieces; piece++) {
    const [t0, t1] = [piece / pieces, (piece + 1) / pieces]
    const controls = [point(t0, t0, t0), point(t0, t0, t1), point(t0, t1, t1), point(t1, t1, t1)]
    lowerMm += Math.hypot(controls[3]![0] - controls[0]![0], controls[3]![1] - controls[0]![1])
    for (let side = 1; side < 4; side++) upperMm += Math.hypot(controls[side]![0] - controls[side - 1]![0], controls[side]![1] - controls[side - 1]![1])
  }
  return { lowerMm, upperMm }
}
