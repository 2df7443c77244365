import type { AnalysisParams } from '../params'
import type { PolylineSet } from '../polylines'
import { grownArray } from '../growArray'
import { bridgeReachMm, type ChunkNeighbours, type CutSegments, cutSegmentsOf, grownBox } from './cutSegments'
import type { CheckGeometry } from './index'
import { oncePerGeometry } from '../memo'
import { type ClosestPoints, closestPointsAt, emptyClosestPoints, stretchWithin } from './segmentGeometry'

/**
 * How two nearby cut segments relate:
 * - `touch`: their centre lines cross or meet (within the chaining tolerance);
 * - `web`: the straight line between their closest points leaves both cuts into material, so it may measure a bridge (unless another cut screens it);
 * - `scrap`: that line runs through the piece that drops out (a slot's inside, the gap between two parts).
 */
export const NEAR_KIND = { touch: 0, web: 1, scrap: 2 } as const

/**
 * Near pairs of cut segments in flat columns (one slot per pair, no object
 * per pair): segment ids `first` < `second` (see CutSegments) and their
 * centre-line distance. Slots are in order of first, then second. The
 * closest points are not stored: `closest` computes them again, exactly as
 * the scan did, for the few pairs that are reported or screened.
 */
export class NearCutList {
  count = 0
  kind: Uint8Array
  sameContour: Uint8Array
  first: Uint32Array
  second: Uint32Array
  distanceMm: Float64Array
  private readonly segments: CutSegments
  private readonly scratch = emptyClosestPoints()

  constructor(segments: CutSegments, capacity = 1024) {
    this.segments = segments
    this.kind = new Uint8Array(capacity)
    this.sameContour = new Uint8Array(capacity)
    this.first = new Uint32Array(capacity)
    this.second = new Uint32Array(capacity)
    this.distanceMm = new Float64Array(capacity)
  }

  push(kind: number, first: number, second: number, sameContour: boolean, distanceMm: number): void {
    if (this.count === this.kind.length) this.grow(2 * this.count)
    const slot = this.count++
    this.kind[slot] = kind
    this.sameContour[slot] = sameContour ? 1 : 0
    this.first[slot] = first
    this.second[slot] = second
    this.distanceMm[slot] = distanceMm
  }

  /** The slots for which `keep` holds, in order, as a new list (this one when all are kept). */
  filter(keep: (slot: number) => boolean): NearCutList {
    const keptSlots = new Uint32Array(this.count)
    let keptCount = 0
    for (let slot = 0; slot < this.count; slot++) if (keep(slot)) keptSlots[keptCount++] = slot
    if (keptCount === this.count) return this
    const kept = new NearCutList(this.segments, Math.max(1, keptCount))
    kept.count = keptCount
    for (let index = 0; index < keptCount; index++) {
      const slot = keptSlots[index]!
      kept.kind[index] = this.kind[slot]!
      kept.sameContour[index] = this.sameContour[slot]!
      kept.first[index] = this.first[slot]!
      kept.second[index] = this.second[slot]!
      kept.distanceMm[index] = this.distanceMm[slot]!
    }
    return kept
  }

  /** Closest points P (on first) and Q (on second) of a slot's pair, in one scratch object: read it before the next call. */
  closest(slot: number): ClosestPoints {
    return closestPointsOf(this.segments, this.first[slot]!, this.second[slot]!, this.scratch)
  }

  private grow(capacity: number): void {
    this.kind = grownArray(this.kind, capacity)
    this.sameContour = grownArray(this.sameContour, capacity)
    this.first = grownArray(this.first, capacity)
    this.second = grownArray(this.second, capacity)
    this.distanceMm = grownArray(this.distanceMm, capacity)
  }
}

function closestPointsOf(segments: CutSegments, first: number, second: number, out: ClosestPoints): ClosestPoints {
  return closestPointsAt(segments.contours.xy, 2 * segments.firstPoint[first]!, 2 * segments.firstPoint[second]!, out)
}

/** A stretch [from, to] (parameters) of a segment that runs along an earlier segment. */
export interface RepeatedStretch {
  from: number
  to: number
  earlier: number
}

export interface PairScan {
  /** Pairs within the bridge reach that do not repeat each other. */
  nearCuts: NearCutList
  /** The chunks near each chunk, within the scan reach (the screening test reuses them). */
  neighbours: ChunkNeighbours
  /** Per segment: its stretches that repeat earlier segments. */
  repeatsOf: Map<number, RepeatedStretch[]>
}

/**
 * Two flattenings of one curve differ by up to a chord tolerance each, and
 * ends within the chaining tolerance count as one point; lines closer than
 * that are the same line.
 */
export function repeatToleranceMm(params: AnalysisParams): number {
  return 2 * params.chordToleranceMm + params.chainToleranceMm
}

export function contourPairKey(contours: PolylineSet, first: number, second: number): number {
  return Math.min(first, second) * contours.count + Math.max(first, second)
}

// Segments more than about 10° apart cross rather than run along each other.
const PARALLEL_SINE = Math.sin((10 * Math.PI) / 180)
// Its square with room for rounding: a pair above it is surely above the sine itself.
const PARALLEL_SINE_SQUARED_CLEARLY = PARALLEL_SINE ** 2 * (1 + 1e-9)
// A shared stretch shorter than this many tolerances is a touch at a corner, not a repeat.
const SHORTEST_REPEAT_IN_TOLERANCES = 2

/**
 * One pass over the pairs of cut segments whose boxes come within the bridge
 * reach (the segment index finds them; the exact segment distance decides).
 * Pairs within the repeat tolerance that run along each other are repeats.
 * Other pairs within the reach are near cuts, except neighbouring segments of
 * one contour and two stretches of one contour that meet at a corner
 * (following the contour from one to the other is not longer than their gap
 * plus twice the reach, so the contour never leaves and comes back).
 */
function scanPairs(geometry: CheckGeometry, params: AnalysisParams): PairScan {
  const segments = cutSegmentsOf(geometry, params)
  const reachMm = bridgeReachMm(params)
  const repeatMm = repeatToleranceMm(params)
  const scanMm = Math.max(reachMm, repeatMm)
  const touchMm = params.chainToleranceMm
  const { xy } = segments.contours
  const { box, chunkBox, chunkStart, contourOf, firstPoint } = segments
  const closest = emptyClosestPoints()
  // Patterns usually have one or two near pairs per segment; the list grows if there are more.
  const neighbours = segments.chunksWithin(scanMm)
  const scan: PairScan = { nearCuts: new NearCutList(segments, Math.max(1024, 2 * segments.count)), neighbours, repeatsOf: new Map() }
  const nearCuts = scan.nearCuts

  const visit = (first: number, second: number) => {
    const a = 4 * first
    const c = 4 * second
    // Boxes within the reach on each axis can still be farther apart than that diagonally, and then hold no points within it.
    const gapX = Math.max(0, box[c]! - box[a + 2]!, box[a]! - box[c + 2]!)
    const gapY = Math.max(0, box[c + 1]! - box[a + 3]!, box[a + 1]! - box[c + 3]!)
    if (gapX * gapX + gapY * gapY >= scanMm * scanMm) return
    const largerGap = Math.max(gapX, gapY)
    if (largerGap <= repeatMm && addRepeat(xy, firstPoint, first, second, repeatMm, scan.repeatsOf)) return
    const sameContour = contourOf[first] === contourOf[second]
    if (sameContour) {
      if (segments.adjacent(first, second)) return
      // Two stretches of one contour that are never far apart along it can only be a corner, or a crossing if their boxes touch.
      if (largerGap > touchMm && segments.farthestAlongMm(first, second) <= 2 * reachMm) return
    }
    closestPointsOf(segments, first, second, closest)
    const { distanceMm } = closest
    if (distanceMm >= reachMm) return
    const alongMm = sameContour ? segments.alongBetweenMm(first, second, closest) : Infinity
    let kind: number
    if (distanceMm <= touchMm) {
      if (alongMm <= 2 * touchMm) return
      kind = NEAR_KIND.touch
    } else {
      if (alongMm <= distanceMm + 2 * reachMm) return
      kind = segments.pointsIntoMaterial(first, closest, true) && segments.pointsIntoMaterial(second, closest, false) ? NEAR_KIND.web : NEAR_KIND.scrap
    }
    nearCuts.push(kind, first, second, sameContour, distanceMm)
  }

  /**
   * Most nearby pairs are segments of one contour around a corner or along a
   * curve; `visit` would drop them (no repeat possible, neighbours, or never
   * far apart along the contour), so they are dropped here with the same tests
   * before any call or distance.
   */
  const isCornerOfOneContour = (first: number, second: number) => {
    const a = 4 * first
    const c = 4 * second
    const gapX = Math.max(0, box[c]! - box[a + 2]!, box[a]! - box[c + 2]!)
    const gapY = Math.max(0, box[c + 1]! - box[a + 3]!, box[a + 1]! - box[c + 3]!)
    // The repeat tolerance is at least the touch tolerance, so boxes farther apart than it can neither repeat nor touch.
    return Math.max(gapX, gapY) > repeatMm && (segments.adjacent(first, second) || segments.farthestAlongMm(first, second) <= 2 * reachMm)
  }

  // Every later segment whose box comes within the reach of this one's, in segment order (the same boxes a search of each segment's box grown by the reach would match).
  const { from, chunks } = neighbours
  const nearBox = new Float64Array(4)
  for (let chunk = 0; chunk < segments.chunkCount; chunk++) {
    for (let first = chunkStart[chunk]!; first < chunkStart[chunk + 1]!; first++) {
      const near = grownBox(box, first, scanMm, nearBox)
      const minX = near[0]!
      const minY = near[1]!
      const maxX = near[2]!
      const maxY = near[3]!
      const contour = contourOf[first]
      for (let slot = from[chunk]!; slot < from[chunk + 1]!; slot++) {
        const other = chunks[slot]!
        if (other < chunk) continue
        // The other chunk came within the reach of this chunk, not necessarily of this segment: one box test can skip all its segments.
        const o = 4 * other
        if (chunkBox[o]! > maxX || chunkBox[o + 1]! > maxY || chunkBox[o + 2]! < minX || chunkBox[o + 3]! < minY) continue
        // A chunk lies on one contour.
        const sameContour = contourOf[chunkStart[other]!] === contour
        for (let second = Math.max(first + 1, chunkStart[other]!); second < chunkStart[other + 1]!; second++) {
          const c = 4 * second
          if (box[c]! > maxX || box[c + 1]! > maxY || box[c + 2]! < minX || box[c + 3]! < minY) continue
          if (sameContour && isCornerOfOneContour(first, second)) continue
          visit(first, second)
        }
      }
    }
  }
  return scan
}

/** Records the stretch of `later` that runs along `earlier` within the tolerance, if there is one. */
function addRepeat(
  xy: Float64Array,
  firstPoint: Uint32Array,
  earlier: number,
  later: number,
  toleranceMm: number,
  repeatsOf: Map<number, RepeatedStretch[]>,
): boolean {
  const p = 2 * firstPoint[earlier]!
  const q = 2 * firstPoint[later]!
  const ax = xy[p]!
  const ay = xy[p + 1]!
  const bx = xy[p + 2]!
  const by = xy[p + 3]!
  const cx = xy[q]!
  const cy = xy[q + 1]!
  const dx = xy[q + 2]!
  const dy = xy[q + 3]!
  const cross = (bx - ax) * (dy - cy) - (by - ay) * (dx - cx)
  // Most pairs that get here are neighbours meeting at an angle: clearly not parallel by squares, before the two roots.
  if (cross * cross > PARALLEL_SINE_SQUARED_CLEARLY * ((bx - ax) ** 2 + (by - ay) ** 2) * ((dx - cx) ** 2 + (dy - cy) ** 2)) return false
  const earlierLength = Math.hypot(bx - ax, by - ay)
  const laterLength = Math.hypot(dx - cx, dy - cy)
  if (earlierLength === 0 || laterLength === 0) return false
  const sine = Math.abs(cross) / (earlierLength * laterLength)
  if (sine > PARALLEL_SINE) return false
  const stretch = stretchWithin(ax, ay, bx, by, cx, cy, dx, dy, toleranceMm)
  if (stretch === null || (stretch[1] - stretch[0]) * laterLength < SHORTEST_REPEAT_IN_TOLERANCES * toleranceMm) return false
  const repeats = repeatsOf.get(later)
  const repeat = { from: stretch[0], to: stretch[1], earlier }
  if (repeats === undefined) repeatsOf.set(later, [repeat])
  else repeats.push(repeat)
  return true
}

/** The params the pair scan depends on. */
export function pairScanSignature(params: AnalysisParams): string {
  return [params.minBridgeMm, params.kerfMm, params.chainToleranceMm, repeatToleranceMm(params)].join(' ')
}

/** The pair scan of a geometry, run once for the checks that need it. */
export const pairScanOf = oncePerGeometry(pairScanSignature, scanPairs)
