import type { AnalysisParams } from '../params'
import type { Finding } from '../result'
import { cutSegmentsOf } from './cutSegments'
import { formatMm } from './format'
import type { CheckGeometry } from './index'
import { type NearCut, nearCutsOf } from './nearCuts'

/**
 * Webs of material narrower than the minimum bridge: the centre-line
 * distance between two cuts less the kerf. Narrow pairs of segments whose
 * sides are the same or neighbouring segments belong to one bridge (union–
 * find over the pairs), reported once at its narrowest point, narrowest
 * bridge first.
 */
export function checkNarrowBridges(geometry: CheckGeometry, params: AnalysisParams): Finding[] {
  const segments = cutSegmentsOf(geometry)
  const narrow = nearCutsOf(geometry, params).filter((near) => near.kind === 'web' && webMm(near, params) < params.minBridgeMm)
  const pairKey = (a: number, b: number) => Math.min(a, b) * segments.count + Math.max(a, b)
  const slotOfPair = new Map(narrow.map((near, slot) => [pairKey(near.first, near.second), slot]))
  const root = narrow.map((_, slot) => slot)
  const find = (slot: number): number => {
    while (root[slot] !== slot) slot = root[slot] = root[root[slot]]
    return slot
  }
  narrow.forEach((near, slot) => {
    for (const first of [near.first, ...segments.neighbours(near.first)]) {
      for (const second of [near.second, ...segments.neighbours(near.second)]) {
        const other = slotOfPair.get(pairKey(first, second))
        if (other !== undefined) root[find(other)] = find(slot)
      }
    }
  })
  const narrowestOfSite = new Map<number, NearCut>()
  narrow.forEach((near, slot) => {
    const site = find(slot)
    const best = narrowestOfSite.get(site)
    if (best === undefined || near.distanceMm < best.distanceMm) narrowestOfSite.set(site, near)
  })
  return [...narrowestOfSite.values()].sort((a, b) => a.distanceMm - b.distanceMm).map((near) => bridgeFinding(near, segments.contourOf, params))
}

function webMm(near: NearCut, params: AnalysisParams): number {
  return near.distanceMm - params.kerfMm
}

function bridgeFinding(near: NearCut, contourOf: Uint32Array, params: AnalysisParams): Finding {
  const widthMm = webMm(near, params)
  const burnsAway = widthMm <= 0
  const message = burnsAway
    ? `The cuts here are ${formatMm(near.distanceMm)} apart, no more than the kerf (${formatMm(params.kerfMm)}): the bridge between them burns away and the piece comes loose.`
    : `The bridge between these cuts is ${formatMm(widthMm)} wide after the kerf; the minimum for this material and cutter is ${formatMm(params.minBridgeMm)}. It may tear or burn through.`
  const contours = near.sameContour ? [contourOf[near.first]] : [contourOf[near.first], contourOf[near.second]]
  return {
    code: 'narrow-bridge',
    severity: burnsAway ? 'error' : 'warning',
    message,
    x: (near.px + near.qx) / 2,
    y: (near.py + near.qy) / 2,
    valueMm: widthMm,
    limitMm: params.minBridgeMm,
    contours,
  }
}
