import fc from 'fast-check'
import { svgPathProperties } from 'svg-path-properties'
import { describe, expect, it } from 'vitest'
import { arcLengthFromOrigin, cubicLengthFromOrigin } from '../../server/analysis/curveLengthPort'

// Reference: svg-path-properties 2.1.0, which measured every arc and cubic before; the engine's port must
// give its length bit for bit (so results do not move), for any arc or cubic from the origin.
function libraryLength(rx: number, ry: number, rotationDeg: number, largeArc: 0 | 1, sweep: 0 | 1, x: number, y: number): number {
  return new svgPathProperties(`M0 0A${rx} ${ry} ${rotationDeg} ${largeArc} ${sweep} ${x} ${y}`).getTotalLength()
}

function expectSameAsLibrary(rx: number, ry: number, rotationDeg: number, largeArc: 0 | 1, sweep: 0 | 1, x: number, y: number): void {
  const expected = libraryLength(rx, ry, rotationDeg, largeArc, sweep, x, y)
  expect(arcLengthFromOrigin(rx, ry, rotationDeg, largeArc === 1, sweep === 1, x, y), `A${rx} ${ry} ${rotationDeg} ${largeArc} ${sweep} ${x} ${y}`).toBe(expected)
}

describe('arc length, bit for bit as svg-path-properties', () => {
  it('agrees on hand-picked arcs: quarter and half circles, ellipses, radii too small, turned, degenerate', () => {
    const cases: Array<[number, number, number, 0 | 1, 0 | 1, number, number]> = [
      [0.4, 0.4, 0, 0, 1, 0.4, 0.4],
      [1, 1, 0, 1, 0, 2, 0],
      [1, 1, 0, 0, 0, 2, 0],
      [5, 2, 30, 1, 1, 3, -4],
      [0.1, 0.1, 0, 0, 1, 10, 0],
      [3, 1, 450, 0, 1, -2, 1],
      [3, 1, -90, 1, 0, 0, 2.5],
      [-2, 3, 0, 0, 1, 1, 1],
      [0, 3, 0, 0, 1, 1, 1],
      [2, 2, 0, 0, 1, 0, 0],
      [1e-9, 1e-9, 0, 0, 1, 1e-9, 1e-9],
      [1000, 1000, 0, 0, 1, 1999.999, 0.001],
    ]
    for (const arc of cases) expectSameAsLibrary(...arc)
  })

  it('agrees on random arcs', () => {
    const size = fc.double({ min: -50, max: 50, noNaN: true, noDefaultInfinity: true })
    const radius = fc.double({ min: 0, max: 60, noNaN: true, noDefaultInfinity: true })
    const flag = fc.constantFrom<0 | 1>(0, 1)
    fc.assert(
      fc.property(radius, radius, fc.double({ min: -720, max: 720, noNaN: true }), flag, flag, size, size, (rx, ry, rotation, largeArc, sweep, x, y) => {
        expectSameAsLibrary(rx, ry, rotation, largeArc, sweep, x, y)
      }),
      { numRuns: 2000, seed: 11 },
    )
  })
})

describe('cubic length, bit for bit as svg-path-properties', () => {
  const libraryCubic = (numbers: number[]) => new svgPathProperties(`M0 0C${numbers.join(' ')}`).getTotalLength()
  it('agrees on hand-picked cubics: a tab, a straight one, a loop, a cusp, a point', () => {
    const cases = [
      [0, -1.2, 2.5, -1.2, 2.5, 0],
      [1, 1, 2, 2, 3, 3],
      [10, 10, -10, 10, 0, 0],
      [5, 0, 0, 5, 5, 5],
      [0, 0, 0, 0, 0, 0],
      [1e-9, 2e-9, -3e-9, 4e-9, 5e-9, 0],
    ]
    for (const numbers of cases) expect(cubicLengthFromOrigin(...(numbers as [number, number, number, number, number, number])), numbers.join(' ')).toBe(libraryCubic(numbers))
  })

  it('agrees on random cubics', () => {
    const coordinate = fc.double({ min: -100, max: 100, noNaN: true, noDefaultInfinity: true })
    fc.assert(
      fc.property(fc.array(coordinate, { minLength: 6, maxLength: 6 }), (numbers) => {
        expect(cubicLengthFromOrigin(...(numbers as [number, number, number, number, number, number]))).toBe(libraryCubic(numbers))
      }),
      { numRuns: 3000, seed: 5 },
    )
  })
})
