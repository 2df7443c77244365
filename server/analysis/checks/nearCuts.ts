import type { AnalysisParams } from '../params'
import { type ChunkNeighbours, type CutSegments, cutSegmentsOf, grownBox } from './cutSegments'
import type { CheckGeometry } from './index'
import { oncePerGeometry } from '../memo'
import { contourPairKey, type NearCutList, pairScanOf, pairScanSignature } from './pairScan'
import { repeatedCutsOf } from './repeatedCuts'
import { crossingOnFirstAt, emptyClosestPoints } from './segmentGeometry'

/** Near cuts of the pair scan less those between contours that repeat each other (the duplicate-cut check reports those). */
function findNearCuts(geometry: CheckGeometry, params: AnalysisParams): NearCutList {
  const { nearCuts } = pairScanOf(geometry, params)
  const { repeatingPairs } = repeatedCutsOf(geometry, params)
  if (repeatingPairs.size === 0) return nearCuts
  const { contours, contourOf } = cutSegmentsOf(geometry, params)
  return nearCuts.filter(
    (slot) =>
      nearCuts.sameContour[slot] === 1 || !repeatingPairs.has(contourPairKey(contours, contourOf[nearCuts.first[slot]!]!, contourOf[nearCuts.second[slot]!]!)),
  )
}

/**
 * Whether another cut crosses the line between a web's closest points, so
 * the two cuts leave no web of their own (the outer two of three parallel
 * slits). Crossings within the touch tolerance of either end are where the
 * line leaves its own cuts' neighbours. The candidates are the segments of
 * the chunks near the first segment's chunk (the pair scan found them); a
 * line reaching beyond that neighbourhood searches the index instead.
 */
export function isScreened(segments: CutSegments, neighbours: ChunkNeighbours, nearCuts: NearCutList, slot: number, touchMm: number): boolean {
  const { px, py, qx, qy } = nearCuts.closest(slot)
  const first = nearCuts.first[slot]!
  const second = nearCuts.second[slot]
  const endMargin = touchMm / nearCuts.distanceMm[slot]!
  const { xy } = segments.contours
  // The line between the web's closest points, and the crossing the test writes to (this call's own, so the engine keeps no state between calls).
  const line = Float64Array.of(px, py, qx, qy)
  const crossing = emptyClosestPoints()
  const crossesInside = (other: number) => {
    if (other === first || other === second) return false
    const along = crossingOnFirstAt(line, xy, 2 * segments.firstPoint[other]!, crossing)
    return along > endMargin && along < 1 - endMargin
  }
  const minX = Math.min(px, qx)
  const minY = Math.min(py, qy)
  const maxX = Math.max(px, qx)
  const maxY = Math.max(py, qy)
  const chunk = segments.chunkOf[first]!
  const near = grownBox(segments.chunkBox, chunk, neighbours.reachMm, new Float64Array(4))
  if (minX < near[0]! || minY < near[1]! || maxX > near[2]! || maxY > near[3]!) {
    let screened = false
    segments.forEachNear(minX, minY, maxX, maxY, (other) => {
      if (!screened && crossesInside(other)) screened = true
    })
    return screened
  }
  const { box, chunkStart } = segments
  for (let slotOfChunk = neighbours.from[chunk]!; slotOfChunk < neighbours.from[chunk + 1]!; slotOfChunk++) {
    const other = neighbours.chunks[slotOfChunk]!
    for (let segment = chunkStart[other]!; segment < chunkStart[other + 1]!; segment++) {
      const c = 4 * segment
      if (box[c]! <= maxX && box[c + 1]! <= maxY && box[c + 2]! >= minX && box[c + 3]! >= minY && crossesInside(segment)) return true
    }
  }
  return false
}

/** The near pairs of a geometry, found once for the checks that need them. */
export const nearCutsOf = oncePerGeometry(pairScanSignature, findNearCuts)
