import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { chainPolylines } from '../../server/analysis/chain'
import { OPERATION_CODES, PolylineSet } from '../../server/analysis/polylines'

const TOLERANCE_MM = 0.01

type Piece = { points: [number, number][]; operation?: number; closed?: boolean }

function pieceSet(pieces: Piece[]): PolylineSet {
  const set = new PolylineSet()
  pieces.forEach(({ points, operation = OPERATION_CODES.cut, closed = false }, element) => {
    set.begin(operation, element)
    for (const [x, y] of points) set.addPoint(x, y)
    set.end(closed, points.length)
  })
  return set
}

function contoursOf(set: PolylineSet): { points: number[][]; closed: boolean; lengthMm: number; element: number }[] {
  return Array.from({ length: set.count }, (_, index) => ({
    points: Array.from({ length: set.pointsOf(index) }, (_, point) =>
      Array.from(set.xy.subarray(2 * (set.start[index]! + point), 2 * (set.start[index]! + point) + 2)),
    ),
    closed: set.closed[index] === 1,
    lengthMm: set.lengthMm[index]!,
    element: set.element[index]!,
  }))
}

describe('chaining', () => {
  // Ends off by less than the tolerance, on both sides of cell borders (multiples of the tolerance), in shuffled order and direction.
  it('joins the sides of a square into one closed contour whatever their order and direction', () => {
    const corners: [number, number][] = [
      [0.02, 0.02],
      [5.02, 0.02],
      [5.02, 5.02],
      [0.02, 5.02],
    ]
    const jitter = [0.004, -0.004, 0.003, -0.002]
    const sides = corners.map((corner, side) => {
      const next = corners[(side + 1) % 4]!
      return [corner, [next[0] + jitter[side]!, next[1] - jitter[side]!]] as [number, number][]
    })
    const anyOrder = fc.shuffledSubarray([0, 1, 2, 3], { minLength: 4, maxLength: 4 })
    const anyDirections = fc.array(fc.boolean(), { minLength: 4, maxLength: 4 })
    fc.assert(
      fc.property(anyOrder, anyDirections, (order, reversed) => {
        const contours = contoursOf(
          chainPolylines(pieceSet(order.map((side, slot) => ({ points: reversed[slot] ? [...sides[side]!].reverse() : sides[side]! }))), TOLERANCE_MM),
        )
        expect(contours).toHaveLength(1)
        expect(contours[0]!.closed).toBe(true)
        expect(contours[0]!.points).toHaveLength(5)
        expect(contours[0]!.points[4]).toEqual(contours[0]!.points[0])
        expect(contours[0]!.lengthMm).toBe(8)
      }),
    )
  })

  // Ends 64 cells apart (0.64 mm at a 0.01 mm tolerance) are far apart, whatever slots their cells take in the grid's table.
  it('keeps apart ends that are many cells apart', () => {
    const foldedX = 1 + 64 * TOLERANCE_MM
    const contours = contoursOf(
      chainPolylines(
        pieceSet([
          { points: [[0, 0], [1, 0]] },
          { points: [[foldedX, 0], [3, 0]] },
        ]),
        TOLERANCE_MM,
      ),
    )
    expect(contours.map((contour) => contour.points)).toEqual([
      [[0, 0], [1, 0]],
      [[foldedX, 0], [3, 0]],
    ])
  })

  // Of equal distances the end listed last wins: at a T the first line continues into the branch drawn after the straight one.
  it('takes the end listed last when two are equally near', () => {
    const contours = contoursOf(
      chainPolylines(
        pieceSet([
          { points: [[0, 0], [1, 0]] },
          { points: [[1, 0], [2, 0]] },
          { points: [[1, 0], [1, 1]] },
        ]),
        TOLERANCE_MM,
      ),
    )
    expect(contours.map(({ points, element }) => ({ points, element }))).toEqual([
      { points: [[0, 0], [1, 0], [1, 1]], element: 0 },
      { points: [[1, 0], [2, 0]], element: 1 },
    ])
  })

  it('copies closed and engrave pieces unchanged and never joins different operations', () => {
    const contours = contoursOf(
      chainPolylines(
        pieceSet([
          { points: [[0, 0], [1, 0], [1, 1], [0, 0]], closed: true },
          { points: [[1, 1], [2, 2]], operation: OPERATION_CODES.engrave },
          { points: [[2, 2], [3, 3]], operation: OPERATION_CODES.score },
          { points: [[3, 3], [4, 4]] },
        ]),
        TOLERANCE_MM,
      ),
    )
    expect(contours.map(({ points, closed }) => ({ points, closed }))).toEqual([
      { points: [[0, 0], [1, 0], [1, 1], [0, 0]], closed: true },
      { points: [[1, 1], [2, 2]], closed: false },
      { points: [[2, 2], [3, 3]], closed: false },
      { points: [[3, 3], [4, 4]], closed: false },
    ])
  })
})
