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
  const ends = TourEnds.of(stops, order)
  const { inX, inY, outX, outY } = ends
  for (let pass = 0; pass < TWO_OPT_PASSES; pass++) {
    let improved = false
    for (let from = 0; from < count; from++) {
      const previousX = from > 0 ? outX[from - 1] : startX
      const previousY = from > 0 ? outY[from - 1] : startY
      const last = Math.min(count, from + TWO_OPT_WINDOW) - 1
      for (let to = from; to <= last; to++) {
        const hasNext = to + 1 < count
        const before = distance(inX[from] - previousX, inY[from] - previousY) + (hasNext ? distance(inX[to + 1] - outX[to], inY[to + 1] - outY[to]) : 0)
        const after = distance(outX[to] - previousX, outY[to] - previousY) + (hasNext ? distance(inX[to + 1] - inX[from], inY[to + 1] - inY[from]) : 0)
        if (after < before - 1e-9) {
          ends.reverseRun(order, from, to)
          improved = true
        }
      }
    }
    if (!improved) return
  }
}

// Math.hypot is several times slower than this in V8; the 2-opt loop only compares the sums.
function distance(dx: number, dy: number): number {
  return Math.sqrt(dx * dx + dy * dy)
}

/** Where the head enters and leaves each tour position, kept in step with the order as runs are reversed. */
class TourEnds {
  private constructor(
    readonly inX: Float64Array,
    readonly inY: Float64Array,
    readonly outX: Float64Array,
    readonly outY: Float64Array,
  ) {}

  static of(stops: TourStops, order: Int32Array): TourEnds {
    const count = order.length
    const ends = new TourEnds(new Float64Array(count), new Float64Array(count), new Float64Array(count), new Float64Array(count))
    for (let position = 0; position < count; position++) {
      const entry = order[position]
      const stop = entry >= 0 ? entry : -1 - entry
      ends.inX[position] = entry >= 0 ? stops.entryX[stop] : stops.exitX[stop]
      ends.inY[position] = entry >= 0 ? stops.entryY[stop] : stops.exitY[stop]
      ends.outX[position] = entry >= 0 ? stops.exitX[stop] : stops.entryX[stop]
      ends.outY[position] = entry >= 0 ? stops.exitY[stop] : stops.entryY[stop]
    }
    return ends
  }

  /** Reverses positions from…to: their order flips and each stop there runs the other way. */
  reverseRun(order: Int32Array, from: number, to: number): void {
    const { inX, inY, outX, outY } = this
    for (let left = from, right = to; left <= right; left++, right--) {
      const leftStop = order[left]
      order[left] = -1 - order[right]
      order[right] = -1 - leftStop
      const leftInX = inX[left]
      const leftInY = inY[left]
      const leftOutX = outX[left]
      const leftOutY = outY[left]
      inX[left] = outX[right]
      inY[left] = outY[right]
      outX[left] = inX[right]
      outY[left] = inY[right]
      inX[right] = leftOutX
      inY[right] = leftOutY
      outX[right] = leftInX
      outY[right] = leftInY
    }
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
