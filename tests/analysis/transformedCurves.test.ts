import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { PathFlattener } from '../../server/analysis/flatten'
import type { Matrix } from '../../server/analysis/matrix'
import { PolylineSet } from '../../server/analysis/polylines'

// Reference: svgpath 2.6 (its matrix(), abs() and Ellipse.transform), through which the engine flattened every
// curve under a transform before. Path data with a number written with an exponent ("12.5e0") is left to
// svgpath by the engine's own path scanner, so the same path flattened both ways must give the same polylines.
function flattened(pathData: string, matrix: Matrix): Record<string, unknown> {
  const set = new PolylineSet()
  new PathFlattener(set, 0.01).flatten(pathData, matrix, 0, 0, false)
  return {
    count: set.count,
    xy: Array.from(set.xy.subarray(0, 2 * set.pointCount)),
    start: Array.from(set.start.subarray(0, set.count + 1)),
    closed: Array.from(set.closed.subarray(0, set.count)),
    lengthMm: Array.from(set.lengthMm.subarray(0, set.count)),
  }
}

const throughSvgpath = (pathData: string) => pathData.replace(/^M(-?\d+(\.\d+)?)/, 'M$1e0')

function expectSameAsSvgpath(pathData: string, matrix: Matrix): void {
  expect(flattened(pathData, matrix), `${pathData} under ${matrix.join(' ')}`).toEqual(flattened(throughSvgpath(pathData), matrix))
}

const MATRICES: Matrix[] = [
  [1, 0, 0, 1, 2, 2],
  [0.26458333, 0, 0, 0.26458333, 0, 0],
  [-1, 0, 0, 1, 10, 0],
  [0.8660254, 0.5, -0.5, 0.8660254, 3, -4],
  [2, 0, 0.5, 1.5, 0, 0],
  [1, 0, 0, -1, 0, 100],
]

describe('absolute curves under a transform, as svgpath transforms them', () => {
  it('flattens circles, arcs, cubics and quadratics the same with and without svgpath', () => {
    const paths = [
      'M12 10A2 2 0 0 1 8 10A2 2 0 0 1 12 10Z',
      'M0 0A5 3 30 1 0 10 4L10 10A2 7 -45 0 1 0 10Z',
      'M2.5 4C2.5 2.8 5 2.8 5 4C5 5.2 2.5 5.2 2.5 4Z',
      'M0 0Q5 10 10 0T20 0',
      'M0 0Q5 10 10 0H20V5L0 5Z',
      'M1 1A3 3 0 0 1 1 1L4 4',
      'M0 0A0 3 0 0 1 5 5',
    ]
    for (const matrix of MATRICES) for (const pathData of paths) expectSameAsSvgpath(pathData, matrix)
  })

  // A property test of 1–2 s alone, several times that on a loaded machine: the default 5 s is too tight.
  it('flattens random absolute paths the same with and without svgpath', () => {
    const coordinate = fc.integer({ min: -2000, max: 2000 }).map((value) => value / 100)
    const radius = fc.integer({ min: 0, max: 1500 }).map((value) => value / 100)
    const segment = fc.oneof(
      fc.tuple(coordinate, coordinate).map(([x, y]) => `L${x} ${y}`),
      fc.tuple(coordinate).map(([x]) => `H${x}`),
      fc.tuple(coordinate, coordinate, coordinate, coordinate, coordinate, coordinate).map((numbers) => `C${numbers.join(' ')}`),
      fc.tuple(coordinate, coordinate, coordinate, coordinate).map((numbers) => `Q${numbers.join(' ')}`),
      fc.tuple(radius, radius, fc.integer({ min: -360, max: 360 }), fc.constantFrom(0, 1), fc.constantFrom(0, 1), coordinate, coordinate).map((numbers) => `A${numbers.join(' ')}`),
      fc.constant('Z'),
    )
    fc.assert(
      fc.property(coordinate, coordinate, fc.array(segment, { minLength: 1, maxLength: 6 }), fc.constantFrom(...MATRICES), (x, y, segments, matrix) => {
        expectSameAsSvgpath(`M${x} ${y}${segments.join('')}`, matrix)
      }),
      { numRuns: 1500, seed: 3 },
    )
  }, 60_000)
})
