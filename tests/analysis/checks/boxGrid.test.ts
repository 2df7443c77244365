import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { BoxGrid } from '../../../server/analysis/checks/boxGrid'

/** Flat [minX, minY, maxX, maxY] boxes from corner and size tuples. */
function flatBoxes(boxes: [number, number, number, number][]): Float64Array {
  return Float64Array.from(boxes.flatMap(([x, y, width, height]) => [x, y, x + width, y + height]))
}

function meetingInOrder(grid: BoxGrid, query: [number, number, number, number]): number[] {
  const met: number[] = []
  grid.forEachMeeting(query[0], query[1], query[2], query[3], (box) => met.push(box))
  return met.sort((a, b) => a - b)
}

function meetingByBruteForce(boxes: Float64Array, query: [number, number, number, number]): number[] {
  const met: number[] = []
  for (let box = 0; 4 * box < boxes.length; box++) {
    if (boxes[4 * box]! <= query[2] && boxes[4 * box + 1]! <= query[3] && boxes[4 * box + 2]! >= query[0] && boxes[4 * box + 3]! >= query[1]) met.push(box)
  }
  return met
}

const coordinate = fc.double({ min: -50, max: 50, noNaN: true })
const size = fc.double({ min: 0, max: 12, noNaN: true })
const box = fc.tuple(coordinate, coordinate, size, size)

describe('box grid', () => {
  it('reports every box that meets a query once, touching included, as a search of all boxes does', () => {
    fc.assert(
      fc.property(fc.array(box, { minLength: 1, maxLength: 60 }), fc.array(box, { minLength: 1, maxLength: 10 }), (placed, queries) => {
        const boxes = flatBoxes(placed)
        const grid = BoxGrid.of(boxes, placed.length, 4)
        if (grid === null) return
        for (const [x, y, width, height] of queries) {
          const query: [number, number, number, number] = [x, y, x + width, y + height]
          expect(meetingInOrder(grid, query)).toEqual(meetingByBruteForce(boxes, query))
        }
      }),
    )
  })

  it('finds a box whose edge only touches the query', () => {
    const grid = BoxGrid.of(flatBoxes([[0, 0, 4, 4], [8, 0, 4, 4]]), 2, 4)!
    expect(meetingInOrder(grid, [4, 0, 8, 1])).toEqual([0, 1])
    expect(meetingInOrder(grid, [4.5, 0, 7.5, 1])).toEqual([])
  })

  it('declines boxes that would each cover many cells (long diagonal cuts), and boxes with no extent', () => {
    const diagonals = flatBoxes(Array.from({ length: 8 }, (_, index): [number, number, number, number] => [index, 0, 100, 100]))
    expect(BoxGrid.of(diagonals, 8, 1)).toBeNull()
    expect(BoxGrid.of(new Float64Array(0), 0, 4)).toBeNull()
    expect(BoxGrid.of(Float64Array.from([0, 0, Number.NaN, 1]), 1, 4)).toBeNull()
  })
})
