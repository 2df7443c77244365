import Flatbush from 'flatbush'

/** Where each contour of a tour is entered and left (the same point for a closed one); any contour may be run backwards. */
export interface TourStops {
  entryX: Float64Array
  entryY: Float64Array
  exitX: Float64Array
  exitY: Float64Array
}

// Common practice, no source: 2-opt restricted to nearby tour positions keeps the pass linear and still removes most crossings.
const TWO_OPT_WINDOW = 24
const TWO_OPT_PASSES = 4

/**
 * Orders the stops from (startX, startY): nearest neighbour through a
 * flatbush index of entry points, then windowed 2-opt passes. Returns the
 * order: stop indices, where −1−i means stop i run backwards.
 */
export function planTour(stops: TourStops, count: number, startX: number, startY: number): Int32Array {
  const order = nearestNeighbourOrder(stops, count, startX, startY)
  improveWithTwoOpt(stops, order, startX, startY)
  return order
}

function nearestNeighbourOrder(stops: TourStops, count: number, startX: number, startY: number): Int32Array {
  const order = new Int32Array(count)
  if (count === 0) return order
  // Each stop is indexed at its entry (item 2i) and its exit (item 2i + 1): a tour may start it from either end.
  const index = new Flatbush(2 * count)
  for (let stop = 0; stop < count; stop++) {
    index.add(stops.entryX[stop], stops.entryY[stop])
    index.add(stops.exitX[stop], stops.exitY[stop])
  }
  index.finish()
  const visited = new Uint8Array(count)
  const usable = (item: number) => visited[item >> 1] === 0
  let x = startX
  let y = startY
  for (let position = 0; position < count; position++) {
    const [item] = index.neighbors(x, y, 1, Infinity, usable)
    const stop = item >> 1
    visited[stop] = 1
    const backwards = (item & 1) === 1
    order[position] = backwards ? -1 - stop : stop
    x = backwards ? stops.entryX[stop] : stops.exitX[stop]
    y = backwards ? stops.entryY[stop] : stops.exitY[stop]
  }
  return order
}

/**
 * Reversing positions i…j of the tour swaps the two edges around it and runs
 * every stop inside backwards; for closed contours (entry = exit) that changes
 * nothing inside, for open ones it is a legal change of direction.
 */
function improveWithTwoOpt(stops: TourStops, order: Int32Array, startX: number, startY: number): void {
  const count = order.length
  const entryX = (position: number) => (order[position] >= 0 ? stops.entryX[order[position]] : stops.exitX[-1 - order[position]])
  const entryY = (position: number) => (order[position] >= 0 ? stops.entryY[order[position]] : stops.exitY[-1 - order[position]])
  const exitX = (position: number) => (position < 0 ? startX : order[position] >= 0 ? stops.exitX[order[position]] : stops.entryX[-1 - order[position]])
  const exitY = (position: number) => (position < 0 ? startY : order[position] >= 0 ? stops.exitY[order[position]] : stops.entryY[-1 - order[position]])
  for (let pass = 0; pass < TWO_OPT_PASSES; pass++) {
    let improved = false
    for (let from = 0; from < count; from++) {
      for (let to = from; to < Math.min(count, from + TWO_OPT_WINDOW); to++) {
        const before = Math.hypot(entryX(from) - exitX(from - 1), entryY(from) - exitY(from - 1)) + (to + 1 < count ? Math.hypot(entryX(to + 1) - exitX(to), entryY(to + 1) - exitY(to)) : 0)
        const after = Math.hypot(exitX(to) - exitX(from - 1), exitY(to) - exitY(from - 1)) + (to + 1 < count ? Math.hypot(entryX(to + 1) - entryX(from), entryY(to + 1) - entryY(from)) : 0)
        if (after < before - 1e-9) {
          reverseRun(order, from, to)
          improved = true
        }
      }
    }
    if (!improved) return
  }
}

function reverseRun(order: Int32Array, from: number, to: number): void {
  for (let left = from, right = to; left <= right; left++, right--) {
    const leftStop = order[left]
    order[left] = -1 - order[right]
    order[right] = -1 - leftStop
  }
}

/** Total straight travel of a tour from the start, plus each travel move's length via `onMove`. */
export function tourTravel(stops: TourStops, order: Int32Array, startX: number, startY: number, onMove: (lengthMm: number) => void): { travelMm: number; endX: number; endY: number } {
  let x = startX
  let y = startY
  let travelMm = 0
  for (const entry of order) {
    const stop = entry >= 0 ? entry : -1 - entry
    const inX = entry >= 0 ? stops.entryX[stop] : stops.exitX[stop]
    const inY = entry >= 0 ? stops.entryY[stop] : stops.exitY[stop]
    const moveMm = Math.hypot(inX - x, inY - y)
    travelMm += moveMm
    onMove(moveMm)
    x = entry >= 0 ? stops.exitX[stop] : stops.entryX[stop]
    y = entry >= 0 ? stops.exitY[stop] : stops.entryY[stop]
  }
  return { travelMm, endX: x, endY: y }
}
