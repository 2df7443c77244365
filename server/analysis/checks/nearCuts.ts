import type { AnalysisParams } from '../params'
import { type CutSegments, cutSegmentsOf } from './cutSegments'
import type { CheckGeometry } from './index'
import { oncePerGeometry } from './memo'
import { contourPairKey, isRepeatedStretch, repeatedCutsOf, repeatToleranceMm } from './repeatedCuts'
import { closestPointsOfSegments, crossingParameters, emptyClosestPoints } from './segmentGeometry'

/**
 * How two nearby cut segments relate:
 * - `touch`: their centre lines cross or meet (within the chaining tolerance);
 * - `web`: the straight line between their closest points leaves both cuts into material, so it may measure a bridge (unless another cut screens it, see `isScreened`);
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

/** How far apart two cuts may be and still leave too narrow a web between them. */
function bridgeReachMm(params: AnalysisParams): number {
  return params.minBridgeMm + params.kerfMm
}

/**
 * Pairs of cut segments whose centre lines come within the bridge reach,
 * found through the segment index (only segments whose boxes come that close
 * are compared, with the exact segment distance). Skipped: neighbouring
 * segments of one contour; two stretches of one contour that meet at a
 * corner (following the contour from one to the other is not longer than
 * their gap plus twice the reach, so the contour never leaves and comes back);
 * pairs that repeat each other (the duplicate-cut check reports those).
 */
function findNearCuts(geometry: CheckGeometry, params: AnalysisParams): NearCut[] {
  const segments = cutSegmentsOf(geometry)
  const repeated = repeatedCutsOf(geometry, params)
  const reachMm = bridgeReachMm(params)
  const reachSquared = reachMm * reachMm
  const touchMm = params.chainToleranceMm
  const repeatMm = repeatToleranceMm(params)
  const { xy } = segments.contours
  const closest = emptyClosestPoints()
  const found: NearCut[] = []
  segments.forEachPairWithin(reachMm, (first, second) => {
    if (segments.adjacent(first, second)) return
    const firstContour = segments.contourOf[first]
    const secondContour = segments.contourOf[second]
    const sameContour = firstContour === secondContour
    if (!sameContour && repeated.repeatingPairs.size > 0 && repeated.repeatingPairs.has(contourPairKey(segments.contours, firstContour, secondContour))) return
    const a = 2 * segments.firstPoint[first]
    const c = 2 * segments.firstPoint[second]
    // The index matched boxes within the reach on each axis; boxes farther apart than that diagonally cannot hold points within it.
    const gapX = Math.max(0, Math.min(xy[c], xy[c + 2]) - Math.max(xy[a], xy[a + 2]), Math.min(xy[a], xy[a + 2]) - Math.max(xy[c], xy[c + 2]))
    const gapY = Math.max(0, Math.min(xy[c + 1], xy[c + 3]) - Math.max(xy[a + 1], xy[a + 3]), Math.min(xy[a + 1], xy[a + 3]) - Math.max(xy[c + 1], xy[c + 3]))
    if (gapX * gapX + gapY * gapY >= reachSquared) return
    // Two stretches of one contour that are never far apart along it can only be a corner, or a crossing if their boxes touch.
    if (sameContour && Math.max(gapX, gapY) > touchMm && segments.farthestAlongMm(first, second) <= 2 * reachMm) return
    closestPointsOfSegments(xy[a], xy[a + 1], xy[a + 2], xy[a + 3], xy[c], xy[c + 1], xy[c + 2], xy[c + 3], closest)
    const { distanceMm, px, py, qx, qy } = closest
    if (distanceMm >= reachMm) return
    if (sameContour && distanceMm <= repeatMm && isRepeatedStretch(segments, first, second, params)) return
    const alongMm = sameContour ? segments.alongBetweenMm(first, closest.u, second, closest.v) : Infinity
    let kind: NearKind
    if (distanceMm <= touchMm) {
      if (alongMm <= 2 * touchMm) return
      kind = 'touch'
    } else {
      if (alongMm <= distanceMm + 2 * reachMm) return
      kind = segments.pointsIntoMaterial(first, closest.u, qx - px, qy - py) && segments.pointsIntoMaterial(second, closest.v, px - qx, py - qy) ? 'web' : 'scrap'
    }
    found.push({ kind, first, second, sameContour, distanceMm, px, py, qx, qy })
  })
  return found
}

/**
 * Whether another cut crosses the line between a web's closest points, so
 * the two cuts leave no web of their own (the outer two of three parallel
 * slits). Crossings within the touch tolerance of either end are where the
 * line leaves its own cuts' neighbours.
 */
export function isScreened(segments: CutSegments, near: NearCut, touchMm: number): boolean {
  const { px, py, qx, qy } = near
  const endMargin = touchMm / near.distanceMm
  const { xy } = segments.contours
  let screened = false
  segments.forEachNear(Math.min(px, qx), Math.min(py, qy), Math.max(px, qx), Math.max(py, qy), (other) => {
    if (screened || other === near.first || other === near.second) return
    const point = 2 * segments.firstPoint[other]
    const crossing = crossingParameters(px, py, qx, qy, xy[point], xy[point + 1], xy[point + 2], xy[point + 3])
    if (crossing !== null && crossing[0] > endMargin && crossing[0] < 1 - endMargin) screened = true
  })
  return screened
}

/** The near pairs of a geometry, found once for the checks that need them. */
export const nearCutsOf = oncePerGeometry((params) => [params.minBridgeMm, params.kerfMm, params.chainToleranceMm, repeatToleranceMm(params)].join(' '), findNearCuts)
