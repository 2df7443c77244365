import type { AnalysisParams } from '../params'
import type { Finding } from '../result'
import { cutSegmentsOf } from './cutSegments'
import { formatMm } from './format'
import type { CheckGeometry } from './index'
import { nearCutsOf } from './nearCuts'
import { contourPairKey, NEAR_KIND } from './pairScan'

/**
 * Separate cuts that cross or meet, or that come within the kerf of each
 * other across the piece that drops out: after cutting they are one cut the
 * drawing did not mean. One finding per pair of contours, where they come
 * closest. (Within the kerf across material is a burnt-away bridge, reported
 * by the narrow-bridge check; exact repeats by the duplicate-cut check.)
 */
export function checkMergedCuts(geometry: CheckGeometry, params: AnalysisParams): Finding[] {
  const segments = cutSegmentsOf(geometry)
  const nearCuts = nearCutsOf(geometry, params)
  const { kind, distanceMm } = nearCuts
  const { touch, scrap } = NEAR_KIND
  const closestOfPair = new Map<number, number>()
  for (let slot = 0; slot < nearCuts.count; slot++) {
    if (nearCuts.sameContour[slot] === 1 || !(kind[slot] === touch || (kind[slot] === scrap && distanceMm[slot] <= params.kerfMm))) continue
    const key = contourPairKey(segments.contours, segments.contourOf[nearCuts.first[slot]], segments.contourOf[nearCuts.second[slot]])
    const best = closestOfPair.get(key)
    if (best === undefined || distanceMm[slot] < distanceMm[best]) closestOfPair.set(key, slot)
  }
  return [...closestOfPair.values()].map((slot) => {
    const { px, py, qx, qy } = nearCuts.closest(slot)
    return {
    code: 'merged-cuts',
    severity: 'error',
    message:
      kind[slot] === NEAR_KIND.touch
        ? 'Two separate cuts cross or meet here, so the piece between them may drop out. Join them into one outline or move them apart.'
        : `Two separate cuts come ${formatMm(distanceMm[slot])} apart, within the kerf (${formatMm(params.kerfMm)}): after cutting they run into each other.`,
    x: (px + qx) / 2,
    y: (py + qy) / 2,
    valueMm: distanceMm[slot] - params.kerfMm,
    limitMm: 0,
    contours: [segments.contourOf[nearCuts.first[slot]], segments.contourOf[nearCuts.second[slot]]],
  }
  })
}
