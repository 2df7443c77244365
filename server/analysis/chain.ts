import { OPERATION_CODES, PolylineSet } from './polylines'

/**
 * Joins open polylines of the same operation whose ends meet within
 * `toleranceMm` into contours (a square drawn as four lines becomes one
 * closed contour, one pierce). Ends are found through a hash grid of cells
 * one tolerance wide, so the work is linear in the number of polylines.
 * Closed and engrave polylines are copied unchanged.
 */
export function chainPolylines(pieces: PolylineSet, toleranceMm: number): PolylineSet {
  const contours = new PolylineSet()
  // The contours never hold more points than the pieces (joints are shared), so their point array is sized once and copyPiece writes into it directly.
  contours.xy = new Float64Array(Math.max(contours.xy.length, 2 * pieces.pointCount))
  // Endpoint ids: 2·piece is a piece's start, 2·piece + 1 its end.
  const endpointX = new Float64Array(2 * pieces.count)
  const endpointY = new Float64Array(2 * pieces.count)
  const gridded = new Uint32Array(2 * pieces.count)
  let griddedCount = 0
  for (let index = 0; index < pieces.count; index++) {
    endpointX[2 * index] = pieces.xy[2 * pieces.start[index]!]!
    endpointY[2 * index] = pieces.xy[2 * pieces.start[index]! + 1]!
    endpointX[2 * index + 1] = pieces.xy[2 * pieces.start[index + 1]! - 2]!
    endpointY[2 * index + 1] = pieces.xy[2 * pieces.start[index + 1]! - 1]!
    if (!isChainable(pieces, index)) continue
    gridded[griddedCount++] = 2 * index
    gridded[griddedCount++] = 2 * index + 1
  }
  const grid = new EndpointGrid(toleranceMm, gridded.subarray(0, griddedCount), endpointX, endpointY)
  const used = new Uint8Array(pieces.count)
  // Partner endpoints found walking from a chain's end (tail) and from its start (head); a chain holds each piece at most once.
  const tail = new Uint32Array(pieces.count)
  const head = new Uint32Array(pieces.count)

  for (let index = 0; index < pieces.count; index++) {
    if (used[index]) continue
    used[index] = 1
    if (!isChainable(pieces, index)) {
      copyPiece(pieces, index, false, contours, true)
      contours.end(pieces.closed[index] === 1, pieces.lengthMm[index]!)
      continue
    }
    // Walk from the end forwards, then from the start backwards; each step takes the nearest free end.
    const tailLength = walkChain(grid, 2 * index + 1, used, pieces.operation, tail)
    const headLength = walkChain(grid, 2 * index, used, pieces.operation, head)
    // Head pieces were found end-first: a partner that is a piece's end means the piece runs forwards into the chain.
    let lengthMm = pieces.lengthMm[index]!
    let first = true
    for (let position = headLength - 1; position >= 0; position--) {
      copyPiece(pieces, head[position]! >> 1, (head[position]! & 1) === 0, contours, first)
      lengthMm += pieces.lengthMm[head[position]! >> 1]!
      first = false
    }
    copyPiece(pieces, index, false, contours, first)
    for (let position = 0; position < tailLength; position++) {
      copyPiece(pieces, tail[position]! >> 1, (tail[position]! & 1) === 1, contours, false)
      lengthMm += pieces.lengthMm[tail[position]! >> 1]!
    }
    contours.end(closeIfEndsMeet(contours, toleranceMm), lengthMm)
  }
  return contours
}

/** Open cut and score pieces chain; closed and engrave ones pass through as they are. */
function isChainable(pieces: PolylineSet, index: number): boolean {
  return pieces.closed[index] === 0 && pieces.operation[index] !== OPERATION_CODES.engrave
}

/** Follows partners from `endpoint`, marking their pieces used and listing them in `partners`; returns how many. */
function walkChain(grid: EndpointGrid, endpoint: number, used: Uint8Array, operation: Uint8Array, partners: Uint32Array): number {
  let count = 0
  for (let partner = grid.nearestFree(endpoint, used, operation); partner >= 0; partner = grid.nearestFree(partner ^ 1, used, operation)) {
    used[partner >> 1] = 1
    partners[count++] = partner
  }
  return count
}

/** Appends a piece's points to the contour begun last (beginning one when `begin`), skipping the shared joint; the caller sized the point array. */
function copyPiece(pieces: PolylineSet, index: number, reversed: boolean, contours: PolylineSet, begin: boolean): void {
  if (begin) contours.begin(pieces.operation[index]!, pieces.element[index]!)
  const first = pieces.start[index]!
  const last = pieces.start[index + 1]! - 1
  const skip = begin ? 0 : 1
  const from = pieces.xy
  const to = contours.xy
  let written = 2 * contours.pointCount
  if (reversed) {
    for (let point = last - skip; point >= first; point--) {
      to[written++] = from[2 * point]!
      to[written++] = from[2 * point + 1]!
    }
  } else {
    for (let point = first + skip; point <= last; point++) {
      to[written++] = from[2 * point]!
      to[written++] = from[2 * point + 1]!
    }
  }
  contours.pointCount = written / 2
}

/** A chain whose two ends meet is closed; its last point is snapped onto the first so the ring is exact. */
function closeIfEndsMeet(contours: PolylineSet, toleranceMm: number): boolean {
  const first = contours.start[contours.count]!
  const last = contours.pointCount - 1
  if (last - first < 2) return false
  const dx = contours.xy[2 * last]! - contours.xy[2 * first]!
  const dy = contours.xy[2 * last + 1]! - contours.xy[2 * first + 1]!
  if (Math.hypot(dx, dy) > toleranceMm) return false
  contours.xy[2 * last] = contours.xy[2 * first]!
  contours.xy[2 * last + 1] = contours.xy[2 * first + 1]!
  return true
}

/**
 * Endpoint ids bucketed by cell (cells one tolerance wide, kept in an
 * open-addressing table of typed arrays), in the order they were listed; a
 * query looks at the 3 × 3 cells around a point.
 */
class EndpointGrid {
  private readonly cellColumn: Float64Array
  private readonly cellRow: Float64Array
  /** Table slot → cell id + 1 (0: empty). */
  private readonly cellInSlot: Int32Array
  private readonly slotMask: number
  /** 32 − log2(slots): the shift that keeps a hash's top bits. */
  private readonly slotShift: number
  /** Endpoints of cell c are byCell[cellStart[c] … cellStart[c + 1]). */
  private readonly cellStart: Uint32Array
  private readonly byCell: Uint32Array
  /** The cell each listed endpoint is in, by endpoint id. */
  private readonly cellOfEndpoint: Int32Array

  constructor(
    private readonly cellSizeMm: number,
    endpoints: Uint32Array,
    private readonly endpointX: Float64Array,
    private readonly endpointY: Float64Array,
  ) {
    let slots = 16
    while (slots < 2 * endpoints.length) slots *= 2
    this.slotMask = slots - 1
    this.slotShift = 32 - Math.log2(slots)
    this.cellInSlot = new Int32Array(slots)
    this.cellColumn = new Float64Array(endpoints.length)
    this.cellRow = new Float64Array(endpoints.length)
    this.cellOfEndpoint = new Int32Array(endpointX.length)
    let cellCount = 0
    for (const endpoint of endpoints) {
      const column = Math.floor(endpointX[endpoint]! / cellSizeMm)
      const row = Math.floor(endpointY[endpoint]! / cellSizeMm)
      let cell = this.cellAt(column, row)
      if (cell < 0) {
        cell = cellCount++
        this.cellColumn[cell] = column
        this.cellRow[cell] = row
        this.cellInSlot[this.freeSlotFor(column, row)] = cell + 1
      }
      this.cellOfEndpoint[endpoint] = cell
    }
    this.cellStart = new Uint32Array(cellCount + 1)
    for (const endpoint of endpoints) this.cellStart[this.cellOfEndpoint[endpoint]! + 1]!++
    for (let cell = 0; cell < cellCount; cell++) this.cellStart[cell + 1]! += this.cellStart[cell]!
    this.byCell = new Uint32Array(endpoints.length)
    const filled = this.cellStart.slice(0, cellCount)
    for (const endpoint of endpoints) this.byCell[filled[this.cellOfEndpoint[endpoint]!]!++] = endpoint
  }

  /**
   * The nearest endpoint within one cell width of `endpoint` (a listed one)
   * whose piece is not used yet and has the same operation (−1: none); of
   * equal distances the one listed last in the last cell looked at wins.
   */
  nearestFree(endpoint: number, used: Uint8Array, operation: Uint8Array): number {
    const x = this.endpointX[endpoint]!
    const y = this.endpointY[endpoint]!
    const column = Math.floor(x / this.cellSizeMm)
    const row = Math.floor(y / this.cellSizeMm)
    const wantedOperation = operation[endpoint >> 1]
    let best = -1
    let bestDistance = this.cellSizeMm
    for (let offsetX = -1; offsetX <= 1; offsetX++) {
      for (let offsetY = -1; offsetY <= 1; offsetY++) {
        const cell = offsetX === 0 && offsetY === 0 ? this.cellOfEndpoint[endpoint]! : this.cellAt(column + offsetX, row + offsetY)
        if (cell < 0) continue
        for (let listed = this.cellStart[cell]!; listed < this.cellStart[cell + 1]!; listed++) {
          const candidate = this.byCell[listed]!
          if (used[candidate >> 1] !== 0 || operation[candidate >> 1] !== wantedOperation) continue
          const distance = Math.hypot(this.endpointX[candidate]! - x, this.endpointY[candidate]! - y)
          if (distance <= bestDistance) {
            best = candidate
            bestDistance = distance
          }
        }
      }
    }
    return best
  }

  private cellAt(column: number, row: number): number {
    for (let slot = this.hash(column, row); ; slot = (slot + 1) & this.slotMask) {
      const cell = this.cellInSlot[slot]! - 1
      if (cell < 0) return -1
      if (this.cellColumn[cell] === column && this.cellRow[cell] === row) return cell
    }
  }

  private freeSlotFor(column: number, row: number): number {
    let slot = this.hash(column, row)
    while (this.cellInSlot[slot] !== 0) slot = (slot + 1) & this.slotMask
    return slot
  }

  // Any mixing works: cells that share a slot chain on, and the stored column and row tell them apart. The top bits of a product mix best.
  private hash(column: number, row: number): number {
    return Math.imul((column | 0) ^ Math.imul(row | 0, 0x85ebca77), 0x9e3779b1) >>> this.slotShift
  }
}
