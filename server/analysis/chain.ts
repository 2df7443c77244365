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
  const grid = new EndpointGrid(toleranceMm)
  const chainable = (index: number) => pieces.closed[index] === 0 && pieces.operation[index] !== OPERATION_CODES.engrave
  for (let index = 0; index < pieces.count; index++) {
    if (chainable(index)) {
      grid.insert(2 * index, pieces.xy[2 * pieces.start[index]], pieces.xy[2 * pieces.start[index] + 1])
      grid.insert(2 * index + 1, pieces.xy[2 * pieces.start[index + 1] - 2], pieces.xy[2 * pieces.start[index + 1] - 1])
    }
  }
  const used = new Uint8Array(pieces.count)
  // Endpoint ids: 2·piece is a piece's start, 2·piece + 1 its end.
  const endpointX = (endpoint: number) => pieces.xy[2 * endpointPoint(pieces, endpoint)]
  const endpointY = (endpoint: number) => pieces.xy[2 * endpointPoint(pieces, endpoint) + 1]
  const partnerOf = (endpoint: number) =>
    grid.nearest(endpointX(endpoint), endpointY(endpoint), (candidate) => used[candidate >> 1] === 0 && pieces.operation[candidate >> 1] === pieces.operation[endpoint >> 1], endpointX, endpointY)

  for (let index = 0; index < pieces.count; index++) {
    if (used[index]) continue
    used[index] = 1
    if (!chainable(index)) {
      copyPiece(pieces, index, false, contours, true)
      contours.end(pieces.closed[index] === 1, pieces.lengthMm[index])
      continue
    }
    // Walk from the end forwards, then from the start backwards; each step takes the nearest free end.
    const tail: number[] = []
    for (let endpoint = 2 * index + 1, partner = partnerOf(endpoint); partner >= 0; partner = partnerOf(endpoint)) {
      used[partner >> 1] = 1
      tail.push(partner)
      endpoint = partner ^ 1
    }
    const head: number[] = []
    for (let endpoint = 2 * index, partner = partnerOf(endpoint); partner >= 0; partner = partnerOf(endpoint)) {
      used[partner >> 1] = 1
      head.push(partner)
      endpoint = partner ^ 1
    }
    // Head pieces were found end-first: a partner that is a piece's end means the piece runs forwards into the chain.
    let lengthMm = pieces.lengthMm[index]
    let first = true
    for (let position = head.length - 1; position >= 0; position--) {
      copyPiece(pieces, head[position] >> 1, (head[position] & 1) === 0, contours, first)
      lengthMm += pieces.lengthMm[head[position] >> 1]
      first = false
    }
    copyPiece(pieces, index, false, contours, first)
    for (const partner of tail) {
      copyPiece(pieces, partner >> 1, (partner & 1) === 1, contours, false)
      lengthMm += pieces.lengthMm[partner >> 1]
    }
    contours.end(closeIfEndsMeet(contours, toleranceMm), lengthMm)
  }
  return contours
}

function endpointPoint(pieces: PolylineSet, endpoint: number): number {
  const piece = endpoint >> 1
  return endpoint & 1 ? pieces.start[piece + 1] - 1 : pieces.start[piece]
}

/** Appends a piece's points to the contour begun last (beginning one when `begin`), skipping the shared joint. */
function copyPiece(pieces: PolylineSet, index: number, reversed: boolean, contours: PolylineSet, begin: boolean): void {
  if (begin) contours.begin(pieces.operation[index], pieces.element[index])
  const first = pieces.start[index]
  const last = pieces.start[index + 1] - 1
  const skip = begin ? 0 : 1
  if (reversed) {
    for (let point = last - skip; point >= first; point--) contours.addPoint(pieces.xy[2 * point], pieces.xy[2 * point + 1])
  } else {
    for (let point = first + skip; point <= last; point++) contours.addPoint(pieces.xy[2 * point], pieces.xy[2 * point + 1])
  }
}

/** A chain whose two ends meet is closed; its last point is snapped onto the first so the ring is exact. */
function closeIfEndsMeet(contours: PolylineSet, toleranceMm: number): boolean {
  const first = contours.start[contours.count]
  const last = contours.pointCount - 1
  if (last - first < 2) return false
  const dx = contours.xy[2 * last] - contours.xy[2 * first]
  const dy = contours.xy[2 * last + 1] - contours.xy[2 * first + 1]
  if (Math.hypot(dx, dy) > toleranceMm) return false
  contours.xy[2 * last] = contours.xy[2 * first]
  contours.xy[2 * last + 1] = contours.xy[2 * first + 1]
  return true
}

/** Endpoint ids bucketed by cell; a query looks at the 3 × 3 cells around a point. */
class EndpointGrid {
  private readonly cells = new Map<number, number[]>()

  constructor(private readonly cellSizeMm: number) {}

  insert(endpoint: number, x: number, y: number): void {
    const key = this.key(Math.floor(x / this.cellSizeMm), Math.floor(y / this.cellSizeMm))
    const bucket = this.cells.get(key)
    if (bucket) bucket.push(endpoint)
    else this.cells.set(key, [endpoint])
  }

  nearest(x: number, y: number, accept: (endpoint: number) => boolean, endpointX: (endpoint: number) => number, endpointY: (endpoint: number) => number): number {
    const cellX = Math.floor(x / this.cellSizeMm)
    const cellY = Math.floor(y / this.cellSizeMm)
    let best = -1
    let bestDistance = this.cellSizeMm
    for (let offsetX = -1; offsetX <= 1; offsetX++) {
      for (let offsetY = -1; offsetY <= 1; offsetY++) {
        for (const endpoint of this.cells.get(this.key(cellX + offsetX, cellY + offsetY)) ?? []) {
          if (!accept(endpoint)) continue
          const distance = Math.hypot(endpointX(endpoint) - x, endpointY(endpoint) - y)
          if (distance <= bestDistance) {
            best = endpoint
            bestDistance = distance
          }
        }
      }
    }
    return best
  }

  // Any fixed mapping works: cells that collide share a bucket, and the distance test sorts them out.
  private key(cellX: number, cellY: number): number {
    return cellX * 0x8000000 + cellY
  }
}
