import type { AnalysisParams } from '../params'
import type { PolylineSet } from '../polylines'
import { type CutSegments, cutSegmentsOf } from './cutSegments'
import type { CheckGeometry } from './index'
import { oncePerGeometry } from './memo'
import { closestPointsOfSegments, emptyClosestPoints, stretchWithin } from './segmentGeometry'

/**
 * How two nearby cut segments relate:
 * - `touch`: their centre lines cross or meet (within the chaining tolerance);
 * - `web`: the straight line between their closest points leaves both cuts into material, so it may measure a bridge (unless another cut screens it);
 * - `scrap`: that line runs through the piece that drops out (a slot's inside, the gap between two parts).
 */
export type NearKind = 'touch' | 'web' | 'scrap'

export interface NearCut {
  kind: NearKind
  /** Segment ids (see CutSegments), first < second. */
  first: number
  second: number
  sameContour: boolean
  distanceMm: number
  px: number
  py: number
  qx: number
  qy: number
}

/** A stretch [from, to] (parameters) of a segment that runs along an earlier segment. */
export interface RepeatedStretch {
  from: number
  to: number
  earlier: number
}

export interface PairScan {
  /** Pairs within the bridge reach that do not repeat each other. */
  nearCuts: NearCut[]
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

/** How far apart two cuts may be and still leave too narrow a web between them. */
function bridgeReachMm(params: AnalysisParams): number {
  return params.minBridgeMm + params.kerfMm
}

export function contourPairKey(contours: PolylineSet, first: number, second: number): number {
  return Math.min(first, second) * contours.count + Math.max(first, second)
}

// Segments more than about 10° apart cross rather than run along each other.
const PARALLEL_SINE = Math.sin((10 * Math.PI) / 180)
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
  const segments = cutSegmentsOf(geometry)
  const reachMm = bridgeReachMm(params)
  const repeatMm = repeatToleranceMm(params)
  const scanMm = Math.max(reachMm, repeatMm)
  const touchMm = params.chainToleranceMm
  const { xy } = segments.contours
  const closest = emptyClosestPoints()
  const scan: PairScan = { nearCuts: [], repeatsOf: new Map() }
  segments.forEachPairWithin(scanMm, (first, second) => {
    const a = 2 * segments.firstPoint[first]
    const c = 2 * segments.firstPoint[second]
    // The index matched boxes within the reach on each axis; boxes farther apart than that diagonally cannot hold points within it.
    const gapX = Math.max(0, Math.min(xy[c], xy[c + 2]) - Math.max(xy[a], xy[a + 2]), Math.min(xy[a], xy[a + 2]) - Math.max(xy[c], xy[c + 2]))
    const gapY = Math.max(0, Math.min(xy[c + 1], xy[c + 3]) - Math.max(xy[a + 1], xy[a + 3]), Math.min(xy[a + 1], xy[a + 3]) - Math.max(xy[c + 1], xy[c + 3]))
    if (gapX * gapX + gapY * gapY >= scanMm * scanMm) return
    const mayRepeat = Math.max(gapX, gapY) <= repeatMm
    if (mayRepeat && addRepeat(segments, first, second, repeatMm, scan.repeatsOf)) return
    if (segments.adjacent(first, second)) return
    const sameContour = segments.contourOf[first] === segments.contourOf[second]
    // Two stretches of one contour that are never far apart along it can only be a corner, or a crossing if their boxes touch.
    if (sameContour && Math.max(gapX, gapY) > touchMm && segments.farthestAlongMm(first, second) <= 2 * reachMm) return
    closestPointsOfSegments(xy[a], xy[a + 1], xy[a + 2], xy[a + 3], xy[c], xy[c + 1], xy[c + 2], xy[c + 3], closest)
    const { distanceMm, px, py, qx, qy } = closest
    if (distanceMm >= reachMm) return
    const alongMm = sameContour ? segments.alongBetweenMm(first, closest.u, second, closest.v) : Infinity
    let kind: NearKind
    if (distanceMm <= touchMm) {
      if (alongMm <= 2 * touchMm) return
      kind = 'touch'
    } else {
      if (alongMm <= distanceMm + 2 * reachMm) return
      kind = segments.pointsIntoMaterial(first, closest.u, qx - px, qy - py) && segments.pointsIntoMaterial(second, closest.v, px - qx, py - qy) ? 'web' : 'scrap'
    }
    scan.nearCuts.push({ kind, first, second, sameContour, distanceMm, px, py, qx, qy })
  })
  return scan
}

/** Records the stretch of `later` that runs along `earlier` within the tolerance, if there is one. */
function addRepeat(segments: CutSegments, earlier: number, later: number, toleranceMm: number, repeatsOf: Map<number, RepeatedStretch[]>): boolean {
  const [ax, ay, bx, by] = segments.ends(earlier)
  const [cx, cy, dx, dy] = segments.ends(later)
  const earlierLength = Math.hypot(bx - ax, by - ay)
  const laterLength = Math.hypot(dx - cx, dy - cy)
  if (earlierLength === 0 || laterLength === 0) return false
  const sine = Math.abs((bx - ax) * (dy - cy) - (by - ay) * (dx - cx)) / (earlierLength * laterLength)
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
