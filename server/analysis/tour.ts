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
 * Orders the stops from (startX, startY): nearest neighbour through a grid
 * of entry and exit points, then windowed 2-opt passes. Returns the order:
 * stop indices, where −1−i means stop i run backwards.
 */
export function planTour(stops: TourStops, count: number, startX: number, startY: number): Int32Array {
  const order = nearestNeighbourOrder(stops, count, startX, startY)
  improveWithTwoOpt(stops, order, startX, startY)
  return order
}

function nearestNeighbourOrder(stops: TourStops, count: number, startX: number, startY: number): Int32Array {
  const order = new Int32Array(count)
  if (count === 0) return order
  const grid = new StopEndGrid(stops, count)
  let x = startX
  let y = startY
  for (let position = 0; position < count; position++) {
    const end = grid.nearest(x, y)
    const stop = end >> 1
    grid.remove(stop)
    const backwards = (end & 1) === 1
    order[position] = backwards ? -1 - stop : stop
    x = backwards ? stops.entryX[stop]! : stops.exitX[stop]!
    y = backwards ? stops.entryY[stop]! : stops.exitY[stop]!
  }
  return order
}

// About two stop ends per cell: a query looks at a handful of points, and an emptied region costs one count test per cell.
const ENDS_PER_CELL = 2

/**
 * Stop ends (2i: entry of stop i, 2i + 1: its exit) bucketed in a uniform
 * grid, with the ends of stops already toured removed. The nearest end is
 * searched ring by ring around the query's cell until no nearer ring can
 * remain; equal distances go to the lower end id, so a closed contour (entry
 * = exit) runs forwards.
 */
class StopEndGrid {
  private readonly minX: number
  private readonly minY: number
  private readonly cellSizeMm: number
  private readonly columns: number
  private readonly rows: number
  private readonly endX: Float64Array
  private readonly endY: Float64Array
  private readonly cellOfEnd: Uint32Array
  /** Ends sorted by cell; cell c's live ends are slots cellStart[c] … cellStart[c] + liveInCell[c]. */
  private readonly cellStart: Uint32Array
  private readonly liveInCell: Uint32Array
  private readonly endInSlot: Uint32Array
  private readonly slotOfEnd: Uint32Array
  /** The search in progress: the nearest live end so far (fields, not an object per query). */
  private bestEnd = -1
  private bestDistanceSquared = Infinity

  constructor(stops: TourStops, count: number) {
    const endCount = 2 * count
    this.endX = new Float64Array(endCount)
    this.endY = new Float64Array(endCount)
    let minX = Infinity
    let minY = Infinity
    let maxX = -Infinity
    let maxY = -Infinity
    for (let stop = 0; stop < count; stop++) {
      this.endX[2 * stop] = stops.entryX[stop]!
      this.endY[2 * stop] = stops.entryY[stop]!
      this.endX[2 * stop + 1] = stops.exitX[stop]!
      this.endY[2 * stop + 1] = stops.exitY[stop]!
    }
    for (let end = 0; end < endCount; end++) {
      minX = Math.min(minX, this.endX[end]!)
      minY = Math.min(minY, this.endY[end]!)
      maxX = Math.max(maxX, this.endX[end]!)
      maxY = Math.max(maxY, this.endY[end]!)
    }
    const widthMm = maxX - minX
    const heightMm = maxY - minY
    const cellCount = Math.max(1, endCount / ENDS_PER_CELL)
    // A drawing that is a single point or a line still needs a cell size above zero.
    const cellSizeMm = widthMm > 0 && heightMm > 0 ? Math.sqrt((widthMm * heightMm) / cellCount) : Math.max(widthMm, heightMm) / cellCount || 1
    this.minX = minX
    this.minY = minY
    this.cellSizeMm = cellSizeMm
    this.columns = Math.min(Math.floor(widthMm / cellSizeMm) + 1, endCount)
    this.rows = Math.min(Math.floor(heightMm / cellSizeMm) + 1, endCount)
    this.cellOfEnd = new Uint32Array(endCount)
    this.cellStart = new Uint32Array(this.columns * this.rows + 1)
    this.liveInCell = new Uint32Array(this.columns * this.rows)
    for (let end = 0; end < endCount; end++) {
      const cell = this.cellIndex(this.column(this.endX[end]!), this.row(this.endY[end]!))
      this.cellOfEnd[end] = cell
      this.liveInCell[cell]!++
    }
    for (let cell = 0; cell < this.liveInCell.length; cell++) this.cellStart[cell + 1] = this.cellStart[cell]! + this.liveInCell[cell]!
    this.endInSlot = new Uint32Array(endCount)
    this.slotOfEnd = new Uint32Array(endCount)
    const filled = new Uint32Array(this.liveInCell.length)
    for (let end = 0; end < endCount; end++) {
      const cell = this.cellOfEnd[end]!
      const slot = this.cellStart[cell]! + filled[cell]!++
      this.endInSlot[slot] = end
      this.slotOfEnd[end] = slot
    }
  }

  /** The nearest live end to (x, y); there must be one. */
  nearest(x: number, y: number): number {
    const centreColumn = this.column(x)
    const centreRow = this.row(y)
    const widestRing = Math.max(centreColumn, this.columns - 1 - centreColumn, centreRow, this.rows - 1 - centreRow)
    this.bestEnd = -1
    this.bestDistanceSquared = Infinity
    for (let ring = 0; ring <= widestRing; ring++) {
      if (ring > 0) {
        // Every cell of this ring lies outside the block of the rings inside it.
        const left = this.minX + (centreColumn - ring + 1) * this.cellSizeMm
        const right = this.minX + (centreColumn + ring) * this.cellSizeMm
        const top = this.minY + (centreRow - ring + 1) * this.cellSizeMm
        const bottom = this.minY + (centreRow + ring) * this.cellSizeMm
        const inside = x >= left && x <= right && y >= top && y <= bottom
        const ringDistance = inside ? Math.min(x - left, right - x, y - top, bottom - y) : 0
        if (this.bestDistanceSquared < ringDistance * ringDistance) break
      }
      const firstRow = Math.max(0, centreRow - ring)
      const lastRow = Math.min(this.rows - 1, centreRow + ring)
      for (let row = firstRow; row <= lastRow; row++) {
        const onEdgeRow = row === centreRow - ring || row === centreRow + ring
        const step = onEdgeRow || ring === 0 ? 1 : 2 * ring
        for (let column = centreColumn - ring; column <= centreColumn + ring; column += step) {
          if (column >= 0 && column < this.columns) this.searchCell(this.cellIndex(column, row), x, y)
        }
      }
    }
    return this.bestEnd
  }

  remove(stop: number): void {
    for (let end = 2 * stop; end <= 2 * stop + 1; end++) {
      const cell = this.cellOfEnd[end]!
      const lastSlot = this.cellStart[cell]! + --this.liveInCell[cell]!
      const slot = this.slotOfEnd[end]!
      const movedEnd = this.endInSlot[lastSlot]!
      this.endInSlot[slot] = movedEnd
      this.slotOfEnd[movedEnd] = slot
      this.endInSlot[lastSlot] = end
      this.slotOfEnd[end] = lastSlot
    }
  }

  private searchCell(cell: number, x: number, y: number): void {
    const first = this.cellStart[cell]!
    const end = first + this.liveInCell[cell]!
    for (let slot = first; slot < end; slot++) {
      const candidate = this.endInSlot[slot]!
      const dx = this.endX[candidate]! - x
      const dy = this.endY[candidate]! - y
      const distanceSquared = dx * dx + dy * dy
      if (distanceSquared < this.bestDistanceSquared || (distanceSquared === this.bestDistanceSquared && candidate < this.bestEnd)) {
        this.bestEnd = candidate
        this.bestDistanceSquared = distanceSquared
      }
    }
  }

  private column(x: number): number {
    return Math.min(this.columns - 1, Math.max(0, Math.floor((x - this.minX) / this.cellSizeMm)))
  }

  private row(y: number): number {
    return Math.min(this.rows - 1, Math.max(0, Math.floor((y - this.minY) / this.cellSizeMm)))
  }

  private cellIndex(column: number, row: number): number {
    return row * this.columns + column
  }
}

/**
 * Reversing positions i…j of the tour swaps the two edges around it and runs
 * every stop inside backwards; for closed contours (entry = exit) that changes
 * nothing inside, for open ones it is a legal change of direction.
 */
function improveWithTwoOpt(stops: TourStops, order: Int32Array, startX: number, startY: number): void {
  const count = order.length
  const ends = TourEnds.of(stops, order, startX, startY)
  const { inX, inY, outX, outY, moveMm } = ends
  // settled[p]: trying p as `from` reversed nothing, and nothing that try reads has changed since, so trying again would reverse nothing.
  const settled = new Uint8Array(count)
  for (let pass = 0; pass < TWO_OPT_PASSES; pass++) {
    let improved = false
    for (let from = 0; from < count; from++) {
      if (settled[from] === 1) continue
      settled[from] = 1
      const previousX = ends.previousX(from)
      const previousY = ends.previousY(from)
      const last = Math.min(count, from + TWO_OPT_WINDOW) - 1
      let moveIn = ends.moveInto(from)
      for (let to = from; to <= last; to++) {
        // The last position's move out is 0 (there is none), so `before` needs no test for it.
        const worthAfter = moveIn + moveMm[to]! - 1e-9
        const newMoveInX = outX[to]! - previousX
        const newMoveInY = outY[to]! - previousY
        // `after` is at least the new move in, and mostly that alone is too long already: a squared test (its margin far above rounding) rules those out without a root.
        if (!(worthAfter > 0) || newMoveInX * newMoveInX + newMoveInY * newMoveInY > worthAfter * worthAfter * (1 + 1e-6)) continue
        const after = distance(newMoveInX, newMoveInY) + (to + 1 < count ? distance(inX[to + 1]! - inX[from]!, inY[to + 1]! - inY[from]!) : 0)
        if (after < worthAfter) {
          ends.reverseRun(order, from, to)
          moveIn = ends.moveInto(from)
          // A try from p reads positions p − 1 … p + window and the moves between them.
          settled.fill(0, Math.max(0, from - TWO_OPT_WINDOW), to + 2)
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

/**
 * Where the head starts, where it enters and leaves each tour position, and
 * the travel move from each position to the next, kept in step with the order
 * as runs are reversed (a reversed run keeps its inner moves, in reverse
 * order).
 */
class TourEnds {
  private constructor(
    readonly inX: Float64Array,
    readonly inY: Float64Array,
    readonly outX: Float64Array,
    readonly outY: Float64Array,
    /** moveMm[p]: from position p's exit to position p + 1's entry; 0 for the last position. */
    readonly moveMm: Float64Array,
    /** The start (x, y), in a typed array so that reading it next to the others stays unboxed arithmetic. */
    private readonly start: Float64Array,
  ) {}

  static of(stops: TourStops, order: Int32Array, startX: number, startY: number): TourEnds {
    const count = order.length
    const ends = new TourEnds(
      new Float64Array(count),
      new Float64Array(count),
      new Float64Array(count),
      new Float64Array(count),
      new Float64Array(count),
      Float64Array.of(startX, startY),
    )
    for (let position = 0; position < count; position++) {
      const entry = order[position]!
      const stop = entry >= 0 ? entry : -1 - entry
      ends.inX[position] = entry >= 0 ? stops.entryX[stop]! : stops.exitX[stop]!
      ends.inY[position] = entry >= 0 ? stops.entryY[stop]! : stops.exitY[stop]!
      ends.outX[position] = entry >= 0 ? stops.exitX[stop]! : stops.entryX[stop]!
      ends.outY[position] = entry >= 0 ? stops.exitY[stop]! : stops.entryY[stop]!
    }
    for (let position = 0; position + 1 < count; position++) ends.measureMove(position)
    return ends
  }

  /** Where the head is before position `from`: the exit of the one before it, or the start for the first. */
  previousX(from: number): number {
    return from > 0 ? this.outX[from - 1]! : this.start[0]!
  }

  previousY(from: number): number {
    return from > 0 ? this.outY[from - 1]! : this.start[1]!
  }

  /** The move into position `from`. */
  moveInto(from: number): number {
    return from > 0 ? this.moveMm[from - 1]! : distance(this.inX[0]! - this.start[0]!, this.inY[0]! - this.start[1]!)
  }

  private measureMove(position: number): void {
    this.moveMm[position] = distance(this.inX[position + 1]! - this.outX[position]!, this.inY[position + 1]! - this.outY[position]!)
  }

  /** Reverses positions from…to: their order flips and each stop there runs the other way. */
  reverseRun(order: Int32Array, from: number, to: number): void {
    const { inX, inY, outX, outY } = this
    for (let left = from, right = to; left <= right; left++, right--) {
      const leftStop = order[left]!
      order[left] = -1 - order[right]!
      order[right] = -1 - leftStop
      const leftInX = inX[left]!
      const leftInY = inY[left]!
      const leftOutX = outX[left]!
      const leftOutY = outY[left]!
      inX[left] = outX[right]!
      inY[left] = outY[right]!
      outX[left] = inX[right]!
      outY[left] = inY[right]!
      inX[right] = leftOutX
      inY[right] = leftOutY
      outX[right] = leftInX
      outY[right] = leftInY
    }
    for (let left = from, right = to - 1; left < right; left++, right--) {
      const leftMove = this.moveMm[left]!
      this.moveMm[left] = this.moveMm[right]!
      this.moveMm[right] = leftMove
    }
    if (from > 0) this.measureMove(from - 1)
    if (to + 1 < order.length) this.measureMove(to)
  }
}

/** Each travel move of a tour from the start (moveMm[p]: into position p), their total, and where the head ends. */
export function tourTravel(
  stops: TourStops,
  order: Int32Array,
  startX: number,
  startY: number,
): { travelMm: number; moveMm: Float64Array; endX: number; endY: number } {
  const moveMm = new Float64Array(order.length)
  let x = startX
  let y = startY
  let travelMm = 0
  for (let position = 0; position < order.length; position++) {
    const entry = order[position]!
    const stop = entry >= 0 ? entry : -1 - entry
    const inX = entry >= 0 ? stops.entryX[stop]! : stops.exitX[stop]!
    const inY = entry >= 0 ? stops.entryY[stop]! : stops.exitY[stop]!
    moveMm[position] = Math.hypot(inX - x, inY - y)
    travelMm += moveMm[position]!
    x = entry >= 0 ? stops.exitX[stop]! : stops.entryX[stop]!
    y = entry >= 0 ? stops.exitY[stop]! : stops.entryY[stop]!
  }
  return { travelMm, moveMm, endX: x, endY: y }
}
