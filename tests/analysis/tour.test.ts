import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { planTour, type TourStops, tourTravel } from '../../server/analysis/tour'

// The reference is an exhaustive nearest-neighbour search (every remaining end tried at every step), ties to the lower end id as documented.
function exhaustiveNearestNeighbourTravel(stops: TourStops, count: number, startX: number, startY: number): number {
  const toured = new Uint8Array(count)
  let x = startX
  let y = startY
  let travelMm = 0
  for (let step = 0; step < count; step++) {
    let best = -1
    let bestSquared = Infinity
    for (let end = 0; end < 2 * count; end++) {
      if (toured[end >> 1]) continue
      const endX = end & 1 ? stops.exitX[end >> 1] : stops.entryX[end >> 1]
      const endY = end & 1 ? stops.exitY[end >> 1] : stops.entryY[end >> 1]
      const squared = (endX - x) ** 2 + (endY - y) ** 2
      if (squared < bestSquared) {
        best = end
        bestSquared = squared
      }
    }
    toured[best >> 1] = 1
    travelMm += Math.sqrt(bestSquared)
    x = best & 1 ? stops.entryX[best >> 1] : stops.exitX[best >> 1]
    y = best & 1 ? stops.entryY[best >> 1] : stops.exitY[best >> 1]
  }
  return travelMm
}

const point = fc.tuple(fc.integer({ min: 0, max: 40 }), fc.integer({ min: 0, max: 40 }))
const stopList = fc.array(fc.tuple(point, point, fc.boolean()), { minLength: 1, maxLength: 60 })

describe('tour', () => {
  it('visits every stop once and never travels more than exhaustive nearest neighbour', () => {
    fc.assert(
      fc.property(stopList, point, (list, [startX, startY]) => {
        // Some stops closed (entry = exit), on a coarse grid so equal distances are common.
        const stops: TourStops = {
          entryX: Float64Array.from(list, ([entry]) => entry[0]),
          entryY: Float64Array.from(list, ([entry]) => entry[1]),
          exitX: Float64Array.from(list, ([entry, exit, closed]) => (closed ? entry[0] : exit[0])),
          exitY: Float64Array.from(list, ([entry, exit, closed]) => (closed ? entry[1] : exit[1])),
        }
        const order = planTour(stops, list.length, startX, startY)
        expect(new Set(Array.from(order, (entry) => (entry >= 0 ? entry : -1 - entry))).size).toBe(list.length)
        const { travelMm } = tourTravel(stops, order, startX, startY, () => {})
        expect(travelMm).toBeLessThanOrEqual(exhaustiveNearestNeighbourTravel(stops, list.length, startX, startY) + 1e-9)
      }),
      { numRuns: 300 },
    )
  })
})
