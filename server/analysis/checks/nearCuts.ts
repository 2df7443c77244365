import type { AnalysisParams } from '../params'
import type { PolylineSet } from '../polylines'
import { type CutSegments, cutSegmentsOf } from './cutSegments'
import type { CheckGeometry } from './index'
import { oncePerGeometry } from './memo'
import { contourPairKey, isRepeatedStretch, repeatedCutsOf, repeatToleranceMm } from './repeatedCuts'
import { type ClosestPoints, closestPointsOfSegments, crossingParameters, emptyClosestPoints } from './segmentGeometry'

/**
 * How two nearby cut segments relate:
 * - `touch`: their centre lines cross or meet (within the chaining tolerance);
 * - `web`: the straight line between their closest points runs through material and crosses no other cut, so it measures a bridge;
 * - `scrap`: that line runs through the piece that drops out (a slot's inside, the gap between two parts);
 * - `screened`: another cut lies between them, so they leave no web of their own.
 */
export type NearKind = 'touch' | 'web' | 'scrap' | 'screened'

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
export function bridgeReachMm(params: AnalysisParams): number {
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
  const touchMm = params.chainToleranceMm
  const closest = emptyClosestPoints()
  const found: NearCut[] = []
  segments.forEachPairWithin(reachMm, (first, second) => {
    if (segments.adjacent(first, second)) return
    const firstContour = segments.contourOf[first]
    const sameContour = firstContour === segments.contourOf[second]
    if (sameContour ? isRepeatedStretch(segments, first, second, params) : repeated.repeatingPairs.has(contourPairKey(segments.contours, firstContour, segments.contourOf[second]))) return
    const [ax, ay, bx, by] = segments.ends(first)
    const [cx, cy, dx, dy] = segments.ends(second)
    closestPointsOfSegments(ax, ay, bx, by, cx, cy, dx, dy, closest)
    const { distanceMm, px, py, qx, qy } = closest
    if (distanceMm >= reachMm) return
    const alongMm = sameContour ? segments.alongBetweenMm(first, closest.u, second, closest.v) : Infinity
    let kind: NearKind
    if (distanceMm <= touchMm) {
      if (alongMm <= 2 * touchMm) return
      kind = 'touch'
    } else {
      if (alongMm <= distanceMm + 2 * reachMm) return
      kind = webKind(segments, first, second, closest, touchMm)
    }
    found.push({ kind, first, second, sameContour, distanceMm, px, py, qx, qy })
  })
  return found
}

function webKind(segments: CutSegments, first: number, second: number, closest: ClosestPoints, touchMm: number): NearKind {
  const { px, py, qx, qy, distanceMm } = closest
  if (!segments.pointsIntoMaterial(first, closest.u, qx - px, qy - py) || !segments.pointsIntoMaterial(second, closest.v, px - qx, py - qy)) return 'scrap'
  // Crossings within the touch tolerance of P or Q are where the line leaves its own cuts' neighbours.
  const endMargin = touchMm / distanceMm
  let screened = false
  segments.forEachNear([Math.min(px, qx), Math.min(py, qy), Math.max(px, qx), Math.max(py, qy)], (other) => {
    if (screened || other === first || other === second) return
    const [ax, ay, bx, by] = segments.ends(other)
    const crossing = crossingParameters(px, py, qx, qy, ax, ay, bx, by)
    if (crossing !== null && crossing[0] > endMargin && crossing[0] < 1 - endMargin) screened = true
  })
  return screened ? 'screened' : 'web'
}

/** The near pairs of a geometry, found once for the checks that need them. */
export const nearCutsOf = oncePerGeometry((params) => [params.minBridgeMm, params.kerfMm, params.chainToleranceMm, repeatToleranceMm(params)].join(' '), findNearCuts)
