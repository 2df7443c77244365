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
  const narrowestOfSite = new Map<number, number>()
  narrow.forEach((near, slot) => {
    const site = siteOf(slot)
    const best = narrowestOfSite.get(site)
    if (best === undefined || near.distanceMm < narrow[best].distanceMm) narrowestOfSite.set(site, slot)
  })
  // Usually the narrowest pair of a site is unscreened; only sites where it is not need their other pairs, widest last.
  const screenedSites = new Set([...narrowestOfSite].filter(([, slot]) => isScreened(segments, narrow[slot], params.chainToleranceMm)).map(([site]) => site))
  const othersOfScreened = new Map<number, number[]>()
  narrow.forEach((_, slot) => {
    const site = siteOf(slot)
    if (!screenedSites.has(site)) return
    const others = othersOfScreened.get(site)
    if (others === undefined) othersOfScreened.set(site, [slot])
    else others.push(slot)
  })
  const reported: number[] = []
  for (const [site, slot] of narrowestOfSite) {
    if (!screenedSites.has(site)) {
      reported.push(slot)
      continue
    }
    const unscreened = othersOfScreened.get(site)!.sort((a, b) => narrow[a].distanceMm - narrow[b].distanceMm).find((other) => !isScreened(segments, narrow[other], params.chainToleranceMm))
    if (unscreened !== undefined) reported.push(unscreened)
  }
  return reported.sort((a, b) => narrow[a].distanceMm - narrow[b].distanceMm).map((slot) => bridgeFinding(narrow[slot], segments.contourOf, params))
}

/**
 * Union–find over the narrow pairs: returns the site (a representative slot)
 * of each slot. The pairs arrive sorted by their first segment (the pair scan
 * goes through segments in order), so the pairs of one first segment form a
 * short row found by offset, and a neighbouring pair is looked up in its row.
 */
function bridgeSites(segments: CutSegments, narrow: NearCut[]): (slot: number) => number {
  const rowStart = new Int32Array(segments.count + 1)
  for (const near of narrow) rowStart[near.first + 1]++
  for (let segment = 0; segment < segments.count; segment++) rowStart[segment + 1] += rowStart[segment]
  const slotOfPair = (a: number, b: number) => {
    const first = Math.min(a, b)
    const second = Math.max(a, b)
    for (let slot = rowStart[first]; slot < rowStart[first + 1]; slot++) if (narrow[slot].second === second) return slot
    return -1
  }
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
        const other = slotOfPair(first, second)
        if (other >= 0) parent[find(other)] = find(slot)
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
