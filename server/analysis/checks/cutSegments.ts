import Flatbush from 'flatbush'
import { cutNesting } from '../containment'
import { BoxGrid } from './boxGrid'
import { OPERATION_CODES, type PolylineSet } from '../polylines'
import type { CheckGeometry } from './index'
import { oncePerGeometry } from '../memo'
import { type ClosestPoints, closestPointsAt, emptyClosestPoints } from './segmentGeometry'
import type { AnalysisParams } from '../params'

/**
 * The straight segments of all cut contours, with what the checks need to
 * tell a bridge from a corner: the contour of each segment, distance along
 * the contour and which side of a closed contour the material is on.
 * Segment k runs from point `firstPoint[k]` to the next.
 *
 * Consecutive segments of one contour are grouped into chunks (at most
 * `SEGMENTS_PER_CHUNK`, box side at most `CHUNK_SIDE_MM`) and the chunks near
 * each chunk are found from their boxes (`chunksWithin`): a query per chunk
 * instead of per segment, and the segments of matched chunks are then
 * compared in a plain loop over their boxes, in segment order.
 */
export class CutSegments {
  readonly contours: PolylineSet
  readonly count: number
  readonly firstPoint: Uint32Array
  readonly contourOf: Uint32Array
  /** Per segment: the segment before it on its contour (a closed contour wraps round), −1 at the start of an open one. */
  readonly previousOf: Int32Array
  /** Per segment: the segment after it on its contour, −1 at the end of an open one. */
  readonly nextOf: Int32Array
  /** Per segment: [minX, minY, maxX, maxY]. */
  readonly box: Float64Array
  /** Chunk c holds segments chunkStart[c] … chunkStart[c + 1] − 1. */
  readonly chunkStart: Uint32Array
  /** Per segment: its chunk. */
  readonly chunkOf: Uint32Array
  readonly chunkCount: number
  /** Per chunk: [minX, minY, maxX, maxY] of its segments. */
  readonly chunkBox: Float64Array
  /** Per point: distance from its contour's first point along the flattened chords. */
  readonly alongMm: Float64Array
  /**
   * Per contour: +1 when the material lies where cross(direction of travel, offset) > 0,
   * −1 when it lies on the other side, 0 for open cuts (material on both sides).
   */
  readonly materialSide: Int8Array
  /** Built on first use: the pair scan's neighbour lists come from a grid, so most drawings never search the tree. */
  private chunkIndex: Flatbush | null | undefined

  /** `reachMm`: how near an open cut must come to a closed cut to show which side of it is material (see `materialSides`). */
  constructor(geometry: CheckGeometry, reachMm: number) {
    const { contours } = geometry
    this.contours = contours
    const cutIds = cutContourIds(contours)
    this.count = cutIds.reduce((sum, id) => sum + contours.pointsOf(id) - 1, 0)
    this.firstPoint = new Uint32Array(this.count)
    this.contourOf = new Uint32Array(this.count)
    this.previousOf = new Int32Array(this.count)
    this.nextOf = new Int32Array(this.count)
    this.box = new Float64Array(4 * this.count)
    this.chunkOf = new Uint32Array(this.count)
    this.alongMm = new Float64Array(contours.pointCount)
    const chunkStart = new Uint32Array(this.count + 1)
    // At most one chunk per segment; trimmed below.
    const chunkBoxes = new Float64Array(4 * this.count)
    let chunkCount = 0
    const { xy, start } = contours
    let segment = 0
    for (const id of cutIds) {
      linkAlongContour(this.previousOf, this.nextOf, segment, contours.pointsOf(id) - 1, contours.closed[id] === 1)
      let chunkMinX = Infinity
      let chunkMinY = Infinity
      let chunkMaxX = -Infinity
      let chunkMaxY = -Infinity
      for (let point = start[id]!; point < start[id + 1]! - 1; point++, segment++) {
        this.firstPoint[segment] = point
        this.contourOf[segment] = id
        const minX = Math.min(xy[2 * point]!, xy[2 * point + 2]!)
        const minY = Math.min(xy[2 * point + 1]!, xy[2 * point + 3]!)
        const maxX = Math.max(xy[2 * point]!, xy[2 * point + 2]!)
        const maxY = Math.max(xy[2 * point + 1]!, xy[2 * point + 3]!)
        this.box[4 * segment] = minX
        this.box[4 * segment + 1] = minY
        this.box[4 * segment + 2] = maxX
        this.box[4 * segment + 3] = maxY
        this.alongMm[point + 1] = this.alongMm[point]! + Math.hypot(xy[2 * point + 2]! - xy[2 * point]!, xy[2 * point + 3]! - xy[2 * point + 1]!)
        const startsChunk =
          point === start[id] ||
          segment - chunkStart[chunkCount - 1]! >= SEGMENTS_PER_CHUNK ||
          Math.max(Math.max(chunkMaxX, maxX) - Math.min(chunkMinX, minX), Math.max(chunkMaxY, maxY) - Math.min(chunkMinY, minY)) > CHUNK_SIDE_MM
        if (startsChunk) {
          if (point !== start[id]) setBox(chunkBoxes, chunkCount - 1, chunkMinX, chunkMinY, chunkMaxX, chunkMaxY)
          chunkStart[chunkCount++] = segment
          chunkMinX = minX
          chunkMinY = minY
          chunkMaxX = maxX
          chunkMaxY = maxY
        } else {
          chunkMinX = Math.min(chunkMinX, minX)
          chunkMinY = Math.min(chunkMinY, minY)
          chunkMaxX = Math.max(chunkMaxX, maxX)
          chunkMaxY = Math.max(chunkMaxY, maxY)
        }
        this.chunkOf[segment] = chunkCount - 1
      }
      if (start[id + 1]! - start[id]! > 1) setBox(chunkBoxes, chunkCount - 1, chunkMinX, chunkMinY, chunkMaxX, chunkMaxY)
    }
    chunkStart[chunkCount] = this.count
    this.chunkStart = chunkStart.subarray(0, chunkCount + 1)
    this.chunkCount = chunkCount
    this.chunkBox = chunkBoxes.slice(0, 4 * chunkCount)
    this.materialSide = materialSides(geometry, cutIds, (closedCut, looseCut) => this.comesWithin(closedCut, looseCut, reachMm))
  }

  /** The tree of the chunk boxes, null when there are none. */
  private index(): Flatbush | null {
    if (this.chunkIndex === undefined) this.chunkIndex = this.chunkCount > 0 ? boxTree(this.chunkBox, this.chunkCount) : null
    return this.chunkIndex
  }

  /**
   * For every chunk, the chunks whose boxes come within `reachMm` of its box
   * (itself included), in ascending order: chunk c's are
   * `chunks[from[c]] … chunks[from[c + 1] − 1]`. Every pair of segments whose
   * boxes come within the reach lies in such a pair of chunks. A grid of the
   * chunk boxes answers the many small queries; the tree when the chunks are
   * too spread out for one.
   */
  chunksWithin(reachMm: number): ChunkNeighbours {
    const from = new Uint32Array(this.chunkCount + 1)
    let chunks = new Uint32Array(Math.max(16, 8 * this.chunkCount))
    let filled = 0
    const keep = (other: number) => {
      if (filled === chunks.length) {
        const grown = new Uint32Array(2 * chunks.length)
        grown.set(chunks)
        chunks = grown
      }
      chunks[filled++] = other
      return false
    }
    const boxes = this.chunkBox
    const grid = BoxGrid.of(boxes, this.chunkCount, CHUNK_SIDE_MM)
    const nearBox = new Float64Array(4)
    for (let chunk = 0; chunk < this.chunkCount; chunk++) {
      from[chunk] = filled
      const near = grownBox(boxes, chunk, reachMm, nearBox)
      if (grid === null) this.index()!.search(near[0]!, near[1]!, near[2]!, near[3]!, keep)
      else grid.forEachMeeting(near[0]!, near[1]!, near[2]!, near[3]!, keep)
      sortInPlace(chunks, from[chunk]!, filled)
    }
    from[this.chunkCount] = filled
    return { reachMm, from, chunks: chunks.subarray(0, filled) }
  }

  /** Calls `visit` for every segment whose box meets [minX, minY, maxX, maxY]. */
  forEachNear(minX: number, minY: number, maxX: number, maxY: number, visit: (segment: number) => void): void {
    const { box, chunkStart } = this
    this.index()?.search(minX, minY, maxX, maxY, (chunk) => {
      for (let segment = chunkStart[chunk]!; segment < chunkStart[chunk + 1]!; segment++) {
        if (box[4 * segment]! <= maxX && box[4 * segment + 1]! <= maxY && box[4 * segment + 2]! >= minX && box[4 * segment + 3]! >= minY) visit(segment)
      }
      return false
    })
  }

  /** Whether a segment of one of the contours `others` accepts comes within `reachMm` of the given contour. */
  private comesWithin(contour: number, others: (contour: number) => boolean, reachMm: number): boolean {
    const { xy, start } = this.contours
    const closest = emptyClosestPoints()
    let found = false
    for (let point = start[contour]!; point < start[contour + 1]! - 1 && !found; point++) {
      const near = [
        Math.min(xy[2 * point]!, xy[2 * point + 2]!) - reachMm,
        Math.min(xy[2 * point + 1]!, xy[2 * point + 3]!) - reachMm,
        Math.max(xy[2 * point]!, xy[2 * point + 2]!) + reachMm,
        Math.max(xy[2 * point + 1]!, xy[2 * point + 3]!) + reachMm,
      ]
      this.forEachNear(near[0]!, near[1]!, near[2]!, near[3]!, (segment) => {
        if (found || !others(this.contourOf[segment]!)) return
        found = closestPointsAt(xy, 2 * point, 2 * this.firstPoint[segment]!, closest).distanceMm <= reachMm
      })
    }
    return found
  }

  /** [ax, ay, bx, by] of a segment. */
  ends(segment: number): [number, number, number, number] {
    const offset = 2 * this.firstPoint[segment]!
    const { xy } = this.contours
    return [xy[offset]!, xy[offset + 1]!, xy[offset + 2]!, xy[offset + 3]!]
  }

  /** Segments of one contour that follow each other, including a closed contour's last and first. */
  adjacent(a: number, b: number): boolean {
    return this.nextOf[a] === b || this.previousOf[a] === b
  }

  /**
   * Distance along the contour between a pair's closest points: parameter u
   * of segment a and v of segment b (same contour; the shorter way round a
   * closed one). The pair's `ClosestPoints` is passed whole, so no
   * coordinates are boxed in the hot loop.
   */
  alongBetweenMm(a: number, b: number, closest: ClosestPoints): number {
    const direct = Math.abs(this.alongAt(a, closest.u) - this.alongAt(b, closest.v))
    const contour = this.contourOf[a]!
    if (this.contours.closed[contour] !== 1) return direct
    const perimeter = this.alongMm[this.contours.start[contour + 1]! - 1]!
    return Math.min(direct, perimeter - direct)
  }

  /** An upper bound of `alongBetweenMm` over all points of two segments of one contour, first < second. */
  farthestAlongMm(first: number, second: number): number {
    const farthest = this.alongMm[this.firstPoint[second]! + 1]! - this.alongMm[this.firstPoint[first]!]!
    const contour = this.contourOf[first]!
    if (this.contours.closed[contour] !== 1) return farthest
    const nearest = this.alongMm[this.firstPoint[second]!]! - this.alongMm[this.firstPoint[first]! + 1]!
    return Math.min(farthest, this.alongMm[this.contours.start[contour + 1]! - 1]! - nearest)
  }

  private alongAt(segment: number, parameter: number): number {
    const point = this.firstPoint[segment]!
    return this.alongMm[point]! + parameter * (this.alongMm[point + 1]! - this.alongMm[point]!)
  }

  /** A closed cut whose inside drops out. */
  isHole(contour: number): boolean {
    const side = this.materialSide[contour]
    return side !== 0 && side !== Math.sign(this.contours.signedArea(contour))
  }

  /**
   * Whether the line between a pair's closest points, from the point on this
   * segment (P at parameter u when it is the pair's first, else Q at v)
   * towards the other, points into material (or along the cut, not away from
   * it). At a corner of a closed cut both segments meeting there count:
   * material on a convex corner lies on the material side of both, on a
   * reflex corner of either.
   */
  pointsIntoMaterial(segment: number, closest: ClosestPoints, isFirst: boolean): boolean {
    const side = this.materialSide[this.contourOf[segment]!]!
    if (side === 0) return true
    const onThisSide = this.materialSideOf(segment, side, closest, isFirst)
    const t = isFirst ? closest.u : closest.v
    const neighbour = t === 0 ? this.previousOf[segment]! : t === 1 ? this.nextOf[segment]! : -1
    if (neighbour < 0) return onThisSide
    const onNeighbourSide = this.materialSideOf(neighbour, side, closest, isFirst)
    const incoming = 2 * this.firstPoint[t === 0 ? neighbour : segment]!
    const outgoing = 2 * this.firstPoint[t === 0 ? segment : neighbour]!
    const { xy } = this.contours
    const turn =
      (xy[incoming + 2]! - xy[incoming]!) * (xy[outgoing + 3]! - xy[outgoing + 1]!) -
      (xy[incoming + 3]! - xy[incoming + 1]!) * (xy[outgoing + 2]! - xy[outgoing]!)
    return side * turn > 0 ? onThisSide && onNeighbourSide : onThisSide || onNeighbourSide
  }

  private materialSideOf(segment: number, side: number, closest: ClosestPoints, fromP: boolean): boolean {
    const dx = fromP ? closest.qx - closest.px : closest.px - closest.qx
    const dy = fromP ? closest.qy - closest.py : closest.py - closest.qy
    const point = 2 * this.firstPoint[segment]!
    const { xy } = this.contours
    const alongX = xy[point + 2]! - xy[point]!
    const alongY = xy[point + 3]! - xy[point + 1]!
    const sideCross = side * (alongX * dy - alongY * dx)
    // The slack is never positive, so a non-negative cross product passes without the two lengths.
    return sideCross >= 0 || sideCross >= -ALONG_THE_CUT_RELATIVE * Math.hypot(alongX, alongY) * Math.hypot(dx, dy)
  }
}

// Past this many neighbours (a crowded drawing) the quadratic insertion sort gives way to the built-in one.
const INSERTION_SORT_LIMIT = 32

/** Ascending order of values[from … to − 1]: a chunk usually has a handful of neighbours, and a typed-array sort call costs more than sorting them by insertion. */
function sortInPlace(values: Uint32Array, from: number, to: number): void {
  if (to - from > INSERTION_SORT_LIMIT) {
    values.subarray(from, to).sort()
    return
  }
  for (let index = from + 1; index < to; index++) {
    const value = values[index]!
    let slot = index
    while (slot > from && values[slot - 1]! > value) {
      values[slot] = values[slot - 1]!
      slot--
    }
    values[slot] = value
  }
}

/** See `CutSegments.chunksWithin`. */
export interface ChunkNeighbours {
  reachMm: number
  from: Uint32Array
  chunks: Uint32Array
}

function cutContourIds(contours: PolylineSet): number[] {
  const ids: number[] = []
  for (let id = 0; id < contours.count; id++) if (contours.operation[id] === OPERATION_CODES.cut) ids.push(id)
  return ids
}

/** Neighbours of the `count` segments of one contour from segment `first` on: a closed contour of two or more segments wraps round. */
function linkAlongContour(previousOf: Int32Array, nextOf: Int32Array, first: number, count: number, closed: boolean): void {
  if (count <= 0) return
  const last = first + count - 1
  for (let segment = first; segment <= last; segment++) {
    previousOf[segment] = segment - 1
    nextOf[segment] = segment + 1
  }
  const wraps = closed && count > 1
  previousOf[first] = wraps ? last : -1
  nextOf[last] = wraps ? first : -1
}

function boxTree(boxes: Float64Array, count: number): Flatbush {
  const tree = new Flatbush(count)
  for (let box = 0; box < count; box++) tree.add(boxes[4 * box]!, boxes[4 * box + 1]!, boxes[4 * box + 2], boxes[4 * box + 3])
  tree.finish()
  return tree
}

function setBox(boxes: Float64Array, index: number, minX: number, minY: number, maxX: number, maxY: number): void {
  boxes[4 * index] = minX
  boxes[4 * index + 1] = minY
  boxes[4 * index + 2] = maxX
  boxes[4 * index + 3] = maxY
}

/** Box `index` of a flat box array grown by `marginMm` on every side, written into `out` (the caller's, reused across a loop). */
export function grownBox(boxes: Float64Array, index: number, marginMm: number, out: Float64Array): Float64Array {
  out[0] = boxes[4 * index]! - marginMm
  out[1] = boxes[4 * index + 1]! - marginMm
  out[2] = boxes[4 * index + 2]! + marginMm
  out[3] = boxes[4 * index + 3]! + marginMm
  return out
}

// An offset within this angle (in radians, as a sine) of the cut's own direction counts as along it, not away from it.
const ALONG_THE_CUT_RELATIVE = 1e-9

// Chunks small enough that comparing all their segments with a neighbouring chunk's wastes little, large enough that most contours of a pattern are one chunk.
const SEGMENTS_PER_CHUNK = 16
const CHUNK_SIDE_MM = 4

/**
 * Which side of each closed cut contour is material. Closed cuts nest: the
 * outermost is a part (material inside), one inside it a hole, and so on.
 * A drawing may also be cut out of a sheet whose edge is not drawn (fold
 * patterns often are): then its outermost closed cuts are holes in that
 * sheet. That is decided per outermost closed cut from the open cuts that lie
 * outside every closed cut ("loose" cuts): it is a hole when the middle of
 * its box lies within the box of the loose cuts (it sits among the slits) or
 * a loose cut comes within `comesWithin`'s reach of it (a slit ending at a
 * relief hole: what lies between them is material). So a stray line beside a
 * part (a construction line left on the cut layer, out of bridge reach)
 * leaves the part a part: an open cut that does not cross a part reaches
 * round the middle of its box only when it is at least half the box's
 * diagonal long.
 */
function materialSides(
  geometry: CheckGeometry,
  cutIds: number[],
  comesWithin: (closedCut: number, isLoose: (contour: number) => boolean) => boolean,
): Int8Array {
  const { contours, bounds } = geometry
  const sides = new Int8Array(contours.count)
  const closedIds = cutIds.filter((id) => contours.closed[id] === 1)
  if (closedIds.length === 0) return sides
  const { parentOf, depth } = cutNesting(geometry)
  const isLoose = (id: number) => contours.closed[id] === 0 && parentOf[id]! < 0
  const looseBox = boxOf(geometry, cutIds.filter(isLoose))
  const inUndrawnSheet = new Map<number, boolean>()
  const isInUndrawnSheet = (outermost: number): boolean => {
    if (looseBox === null) return false
    let inSheet = inUndrawnSheet.get(outermost)
    if (inSheet === undefined) {
      const middleX = (bounds[4 * outermost]! + bounds[4 * outermost + 2]!) / 2
      const middleY = (bounds[4 * outermost + 1]! + bounds[4 * outermost + 3]!) / 2
      inSheet = (middleX >= looseBox[0]! && middleY >= looseBox[1]! && middleX <= looseBox[2]! && middleY <= looseBox[3]!) || comesWithin(outermost, isLoose)
      inUndrawnSheet.set(outermost, inSheet)
    }
    return inSheet
  }
  for (const id of closedIds) {
    let outermost = id
    while (parentOf[outermost]! >= 0) outermost = parentOf[outermost]!
    const insideIsMaterial = (depth[id]! + (isInUndrawnSheet(outermost) ? 1 : 0)) % 2 === 0
    // A positive shoelace area means the inside is where cross(direction, offset) > 0.
    sides[id] = Math.sign(contours.signedArea(id)) * (insideIsMaterial ? 1 : -1)
  }
  return sides
}

/** [minX, minY, maxX, maxY] round the given contours, null when there are none. */
function boxOf({ bounds }: CheckGeometry, ids: number[]): Float64Array | null {
  const box = new Float64Array([Infinity, Infinity, -Infinity, -Infinity])
  for (const id of ids) {
    box[0] = Math.min(box[0]!, bounds[4 * id]!)
    box[1] = Math.min(box[1]!, bounds[4 * id + 1]!)
    box[2] = Math.max(box[2]!, bounds[4 * id + 2]!)
    box[3] = Math.max(box[3]!, bounds[4 * id + 3]!)
  }
  return box[0]! <= box[2]! ? box : null
}

/** How far apart two cuts may be and still leave too narrow a web between them. */
export function bridgeReachMm(params: AnalysisParams): number {
  return params.minBridgeMm + params.kerfMm
}

/** The cut segments of a geometry, built once and shared by the checks. */
export const cutSegmentsOf = oncePerGeometry(
  (params: AnalysisParams) => String(bridgeReachMm(params)),
  (geometry, params) => new CutSegments(geometry, bridgeReachMm(params)),
)
