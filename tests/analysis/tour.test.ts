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
        const { travelMm } = tourTravel(stops, order, startX, startY)
        expect(travelMm).toBeLessThanOrEqual(exhaustiveNearestNeighbourTravel(stops, list.length, startX, startY) + 1e-9)
      }),
      { numRuns: 300 },
    )
  })

  // Recorded from the tour as first written (nearest neighbour, then windowed 2-opt, every window tried in every pass): faster versions must keep every choice, ties included.
  it('keeps the recorded orders and travel on fixed scattered sets', () => {
    let checksum = 0
    let travelMm = 0
    for (const count of [40, 300, 600]) {
      for (let seed = 1; seed <= 20; seed++) {
        const stops = scatteredStops(count, seed)
        const order = planTour(stops, count, 3, 4)
        checksum = order.reduce((sum, entry, position) => (sum + Math.imul(entry, position + 1)) | 0, checksum)
        travelMm += tourTravel(stops, order, 3, 4).travelMm
      }
    }
    expect(checksum).toBe(346413772)
    expect(travelMm).toBe(21699.741642811055)
  })
})

/** Stops on a half-millimetre grid (equal distances are common), half of them closed, from a fixed linear congruential sequence. */
function scatteredStops(count: number, seed: number): TourStops {
  let state = seed
  const next = () => (state = (Math.imul(state, 1103515245) + 12345) >>> 0) / 2 ** 32
  const stops: TourStops = { entryX: new Float64Array(count), entryY: new Float64Array(count), exitX: new Float64Array(count), exitY: new Float64Array(count) }
  for (let stop = 0; stop < count; stop++) {
    stops.entryX[stop] = Math.floor(next() * 60) / 2
    stops.entryY[stop] = Math.floor(next() * 60) / 2
    const closed = next() < 0.5
    stops.exitX[stop] = closed ? stops.entryX[stop] : Math.floor(next() * 60) / 2
    stops.exitY[stop] = closed ? stops.entryY[stop] : Math.floor(next() * 60) / 2
  }
  return stops
}
