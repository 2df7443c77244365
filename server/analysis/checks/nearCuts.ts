import type { AnalysisParams } from '../params'
import { type CutSegments, cutSegmentsOf } from './cutSegments'
import type { CheckGeometry } from './index'
import { oncePerGeometry } from './memo'
import { contourPairKey, type NearCutList, pairScanOf, pairScanSignature } from './pairScan'
import { repeatedCutsOf } from './repeatedCuts'
import { crossing, findCrossing } from './segmentGeometry'

/** Near cuts of the pair scan less those between contours that repeat each other (the duplicate-cut check reports those). */
function findNearCuts(geometry: CheckGeometry, params: AnalysisParams): NearCutList {
  const { nearCuts } = pairScanOf(geometry, params)
  const { repeatingPairs } = repeatedCutsOf(geometry, params)
  if (repeatingPairs.size === 0) return nearCuts
  const { contours, contourOf } = cutSegmentsOf(geometry)
  return nearCuts.filter((slot) => nearCuts.sameContour[slot] === 1 || !repeatingPairs.has(contourPairKey(contours, contourOf[nearCuts.first[slot]], contourOf[nearCuts.second[slot]])))
}

/**
 * Whether another cut crosses the line between a web's closest points, so
 * the two cuts leave no web of their own (the outer two of three parallel
 * slits). Crossings within the touch tolerance of either end are where the
 * line leaves its own cuts' neighbours.
 */
export function isScreened(segments: CutSegments, nearCuts: NearCutList, slot: number, touchMm: number): boolean {
  const ends = 4 * slot
  const px = nearCuts.ends[ends]
  const py = nearCuts.ends[ends + 1]
  const qx = nearCuts.ends[ends + 2]
  const qy = nearCuts.ends[ends + 3]
  const first = nearCuts.first[slot]
  const second = nearCuts.second[slot]
  const endMargin = touchMm / nearCuts.distanceMm[slot]
  const { xy } = segments.contours
  let screened = false
  segments.forEachNear(Math.min(px, qx), Math.min(py, qy), Math.max(px, qx), Math.max(py, qy), (other) => {
    if (screened || other === first || other === second) return
    const point = 2 * segments.firstPoint[other]
    if (findCrossing(px, py, qx, qy, xy[point], xy[point + 1], xy[point + 2], xy[point + 3]) && crossing[0] > endMargin && crossing[0] < 1 - endMargin) screened = true
  })
  return screened
}

/** The near pairs of a geometry, found once for the checks that need them. */
export const nearCutsOf = oncePerGeometry(pairScanSignature, findNearCuts)
