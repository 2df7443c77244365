import type { AnalysisParams } from '../params'
import type { Finding } from '../result'
import { type CutSegments, cutSegmentsOf } from './cutSegments'
import { formatMm } from './format'
import type { CheckGeometry } from './index'
import { isScreened, type NearCut, nearCutsOf } from './nearCuts'

/**
 * Webs of material narrower than the minimum bridge: the centre-line
 * distance between two cuts less the kerf. Narrow pairs of segments whose
 * sides are the same or neighbouring segments belong to one bridge (union–
 * find over the pairs); each bridge is reported once, at its narrowest pair
 * that no other cut screens, narrowest bridge first.
 */
export function checkNarrowBridges(geometry: CheckGeometry, params: AnalysisParams): Finding[] {
  const segments = cutSegmentsOf(geometry)
  const narrow = nearCutsOf(geometry, params).filter((near) => near.kind === 'web' && webMm(near, params) < params.minBridgeMm)
  const siteOf = bridgeSites(segments, narrow)
  const byWidth = Array.from(narrow.keys()).sort((a, b) => narrow[a].distanceMm - narrow[b].distanceMm)
  const reported = new Uint8Array(narrow.length)
  const findings: Finding[] = []
  for (const slot of byWidth) {
    const site = siteOf(slot)
    if (reported[site] || isScreened(segments, narrow[slot], params.chainToleranceMm)) continue
    reported[site] = 1
    findings.push(bridgeFinding(narrow[slot], segments.contourOf, params))
  }
  return findings
}

/** Union–find over the narrow pairs: returns the site (a representative slot) of each slot. */
function bridgeSites(segments: CutSegments, narrow: NearCut[]): (slot: number) => number {
  const pairKey = (a: number, b: number) => Math.min(a, b) * segments.count + Math.max(a, b)
  const slotOfPair = new Map<number, number>()
  narrow.forEach((near, slot) => slotOfPair.set(pairKey(near.first, near.second), slot))
  const parent = Int32Array.from(narrow.keys())
  const find = (slot: number): number => {
    while (parent[slot] !== slot) slot = parent[slot] = parent[parent[slot]]
    return slot
  }
  const firstSides = new Int32Array(3)
  const secondSides = new Int32Array(3)
  narrow.forEach((near, slot) => {
    withNeighbours(segments, near.first, firstSides)
    withNeighbours(segments, near.second, secondSides)
    for (const first of firstSides) {
      for (const second of secondSides) {
        if (first < 0 || second < 0) continue
        const other = slotOfPair.get(pairKey(first, second))
        if (other !== undefined) parent[find(other)] = find(slot)
      }
    }
  })
  return find
}

/** The segment and its neighbours along the contour into `out` (−1 where there is none). */
function withNeighbours(segments: CutSegments, segment: number, out: Int32Array): void {
  out[0] = segment
  out[1] = segments.previous(segment)
  out[2] = segments.next(segment)
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
