import type { AnalysisParams } from '../params'
import { type CutSegments, cutSegmentsOf } from './cutSegments'
import type { CheckGeometry } from './index'
import { oncePerGeometry } from './memo'
import { contourPairKey, type NearCut, pairScanOf, pairScanSignature } from './pairScan'
import { repeatedCutsOf } from './repeatedCuts'
import { crossingParameters } from './segmentGeometry'

export type { NearCut, NearKind } from './pairScan'

/** Near cuts of the pair scan less those between contours that repeat each other (the duplicate-cut check reports those). */
function findNearCuts(geometry: CheckGeometry, params: AnalysisParams): NearCut[] {
  const { nearCuts } = pairScanOf(geometry, params)
  const { repeatingPairs } = repeatedCutsOf(geometry, params)
  if (repeatingPairs.size === 0) return nearCuts
  const segments = cutSegmentsOf(geometry)
  return nearCuts.filter((near) => near.sameContour || !repeatingPairs.has(contourPairKey(segments.contours, segments.contourOf[near.first], segments.contourOf[near.second])))
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
export const nearCutsOf = oncePerGeometry(pairScanSignature, findNearCuts)
