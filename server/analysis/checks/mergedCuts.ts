import type { AnalysisParams } from '../params'
import type { Finding } from '../result'
import { cutSegmentsOf } from './cutSegments'
import { formatMm } from './format'
import type { CheckGeometry } from './index'
import { type NearCut, nearCutsOf } from './nearCuts'
import { contourPairKey } from './pairScan'

/**
 * Separate cuts that cross or meet, or that come within the kerf of each
 * other across the piece that drops out: after cutting they are one cut the
 * drawing did not mean. One finding per pair of contours, where they come
 * closest. (Within the kerf across material is a burnt-away bridge, reported
 * by the narrow-bridge check; exact repeats by the duplicate-cut check.)
 */
export function checkMergedCuts(geometry: CheckGeometry, params: AnalysisParams): Finding[] {
  const segments = cutSegmentsOf(geometry)
  const closestOfPair = new Map<number, NearCut>()
  for (const near of nearCutsOf(geometry, params)) {
    if (near.sameContour || !(near.kind === 'touch' || (near.kind === 'scrap' && near.distanceMm <= params.kerfMm))) continue
    const key = contourPairKey(segments.contours, segments.contourOf[near.first], segments.contourOf[near.second])
    const best = closestOfPair.get(key)
    if (best === undefined || near.distanceMm < best.distanceMm) closestOfPair.set(key, near)
  }
  return [...closestOfPair.values()].map((near) => ({
    code: 'merged-cuts',
    severity: 'error',
    message:
      near.kind === 'touch'
        ? 'Two separate cuts cross or meet here, so the piece between them may drop out. Join them into one outline or move them apart.'
        : `Two separate cuts come ${formatMm(near.distanceMm)} apart, within the kerf (${formatMm(params.kerfMm)}): after cutting they run into each other.`,
    x: (near.px + near.qx) / 2,
    y: (near.py + near.qy) / 2,
    valueMm: near.distanceMm - params.kerfMm,
    limitMm: 0,
    contours: [segments.contourOf[near.first], segments.contourOf[near.second]],
  }))
}
