import type { FindingCollector } from '../findings'
import type { AnalysisParams } from '../params'
import { cutSegmentsOf } from './cutSegments'
import type { CheckGeometry } from './index'
import { nearCutsOf } from './nearCuts'
import { contourPairKey, NEAR_KIND } from './pairScan'

/**
 * Separate cuts that cross or meet, or that come within the kerf of each
 * other across the piece that drops out: after cutting they are one cut the
 * drawing did not mean. One site per pair of contours, where they come
 * closest. (Within the kerf across material is a burnt-away bridge, reported
 * by the narrow-bridge check; exact repeats by the duplicate-cut check.)
 */
export function checkMergedCuts(geometry: CheckGeometry, params: AnalysisParams, findings: FindingCollector): void {
  const segments = cutSegmentsOf(geometry, params)
  const nearCuts = nearCutsOf(geometry, params)
  const { kind, distanceMm } = nearCuts
  const { touch, scrap } = NEAR_KIND
  const closestOfPair = new Map<number, number>()
  for (let slot = 0; slot < nearCuts.count; slot++) {
    if (nearCuts.sameContour[slot] === 1 || !(kind[slot] === touch || (kind[slot] === scrap && distanceMm[slot]! <= params.kerfMm))) continue
    const key = contourPairKey(segments.contours, segments.contourOf[nearCuts.first[slot]!]!, segments.contourOf[nearCuts.second[slot]!]!)
    const best = closestOfPair.get(key)
    if (best === undefined || distanceMm[slot]! < distanceMm[best]!) closestOfPair.set(key, slot)
  }
  const facts = { kerfMm: params.kerfMm }
  // Crossing or meeting centre lines, or within the kerf across the piece that drops out.
  const touching = findings.group({ code: 'merged-cuts', severity: 'error', cause: 'touch', limitMm: 0, facts, worstFirst: 'smallest' })
  const withinKerf = findings.group({ code: 'merged-cuts', severity: 'error', cause: 'within-kerf', limitMm: 0, facts, worstFirst: 'smallest' })
  for (const slot of closestOfPair.values()) {
    const { px, py, qx, qy } = nearCuts.closest(slot)
    const sites = kind[slot] === touch ? touching : withinKerf
    sites.add(
      (px + qx) / 2,
      (py + qy) / 2,
      distanceMm[slot]! - params.kerfMm,
      segments.contourOf[nearCuts.first[slot]!],
      segments.contourOf[nearCuts.second[slot]!],
    )
  }
}
