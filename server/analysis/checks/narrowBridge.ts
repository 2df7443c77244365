import type { FindingCollector, SiteList } from '../findings'
import type { AnalysisParams } from '../params'
import { type CutSegments, cutSegmentsOf } from './cutSegments'
import type { CheckGeometry } from './index'
import { isScreened, nearCutsOf } from './nearCuts'
import { NEAR_KIND, type NearCutList, pairScanOf } from './pairScan'

/**
 * Webs of material narrower than the minimum bridge: the centre-line
 * distance between two cuts less the kerf. Narrow pairs of segments whose
 * sides are the same or neighbouring segments belong to one bridge (union–
 * find over the pairs); each bridge is reported once, at its narrowest pair
 * that no other cut screens, narrowest bridge first.
 */
export function checkNarrowBridges(geometry: CheckGeometry, params: AnalysisParams, findings: FindingCollector): void {
  const segments = cutSegmentsOf(geometry, params)
  const nearCuts = nearCutsOf(geometry, params)
  const { neighbours } = pairScanOf(geometry, params)
  const web = NEAR_KIND.web
  const narrow = nearCuts.filter((slot) => nearCuts.kind[slot] === web && nearCuts.distanceMm[slot]! - params.kerfMm < params.minBridgeMm)
  const { distanceMm } = narrow
  const siteOf = bridgeSites(segments, narrow)
  // Sites in the order their first pair comes, each with its narrowest pair (the first of equally narrow ones).
  const sites: number[] = []
  const narrowestOfSite = new Int32Array(narrow.count).fill(-1)
  for (let slot = 0; slot < narrow.count; slot++) {
    const site = siteOf[slot]!
    const best = narrowestOfSite[site]!
    if (best < 0) sites.push(site)
    if (best < 0 || distanceMm[slot]! < distanceMm[best]!) narrowestOfSite[site] = slot
  }
  // Usually the narrowest pair of a site is unscreened; only sites where it is not need their other pairs, widest last.
  const screenedSite = new Uint8Array(narrow.count)
  let screenedCount = 0
  for (const site of sites) {
    if (!isScreened(segments, neighbours, narrow, narrowestOfSite[site]!, params.chainToleranceMm)) continue
    screenedSite[site] = 1
    screenedCount++
  }
  const othersOfScreened = new Map<number, number[]>()
  for (let slot = 0; slot < narrow.count && screenedCount > 0; slot++) {
    const site = siteOf[slot]!
    if (screenedSite[site] === 0) continue
    const others = othersOfScreened.get(site)
    if (others === undefined) othersOfScreened.set(site, [slot])
    else others.push(slot)
  }
  const reported: number[] = []
  for (const site of sites) {
    if (screenedSite[site] === 0) {
      reported.push(narrowestOfSite[site]!)
      continue
    }
    const unscreened = othersOfScreened
      .get(site)!
      .sort((a, b) => distanceMm[a]! - distanceMm[b]!)
      .find((other) => !isScreened(segments, neighbours, narrow, other, params.chainToleranceMm))
    if (unscreened !== undefined) reported.push(unscreened)
  }
  const groups = bridgeGroups(findings, params)
  for (const slot of reported.sort((a, b) => distanceMm[a]! - distanceMm[b]!)) addBridgeSite(narrow, slot, segments.contourOf, params, groups)
}

/**
 * Union–find over the narrow pairs: the site (a representative slot) of each
 * slot. The pairs arrive sorted by first segment, then second (the pair scan
 * goes through segments in order), so the pairs of one first segment form a
 * short row found by offset, and a neighbouring pair is found by walking its
 * row (a dozen pairs at most in a dense pattern, fewer steps than bisection). Joining is symmetric, so each slot looks only for pairs that
 * come after it; the earlier ones found it already.
 */
function bridgeSites(segments: CutSegments, narrow: NearCutList): Int32Array {
  const { first: firstOf, second: secondOf } = narrow
  const rowStart = new Int32Array(segments.count + 1)
  for (let slot = 0; slot < narrow.count; slot++) rowStart[firstOf[slot]! + 1]!++
  for (let segment = 0; segment < segments.count; segment++) rowStart[segment + 1]! += rowStart[segment]!
  const laterSlotOfPair = (slot: number, a: number, b: number) => {
    const first = Math.min(a, b)
    const second = Math.max(a, b)
    if (first < firstOf[slot]! || (first === firstOf[slot] && second <= secondOf[slot]!)) return -1
    const end = rowStart[first + 1]!
    let low = rowStart[first]!
    while (low < end && secondOf[low]! < second) low++
    return low < end && secondOf[low] === second ? low : -1
  }
  const parent = new Int32Array(narrow.count)
  for (let slot = 0; slot < narrow.count; slot++) parent[slot] = slot
  const find = (slot: number): number => {
    while (parent[slot] !== slot) slot = parent[slot] = parent[parent[slot]!]!
    return slot
  }
  const { previousOf, nextOf } = segments
  const firstSides = new Int32Array(3)
  const secondSides = new Int32Array(3)
  for (let slot = 0; slot < narrow.count; slot++) {
    const first = firstOf[slot]!
    const second = secondOf[slot]!
    firstSides[0] = first
    firstSides[1] = previousOf[first]!
    firstSides[2] = nextOf[first]!
    secondSides[0] = second
    secondSides[1] = previousOf[second]!
    secondSides[2] = nextOf[second]!
    // Found on the first join; it stays a root while this slot joins others (only their roots move).
    let root = -1
    // A pair with a side before this slot's first segment (or none, −1) comes earlier.
    for (let i = 0; i < 3; i++) {
      if (firstSides[i]! < first) continue
      for (let j = 0; j < 3; j++) {
        if (secondSides[j]! < first) continue
        const other = laterSlotOfPair(slot, firstSides[i]!, secondSides[j]!)
        if (other < 0) continue
        if (root < 0) root = find(slot)
        parent[find(other)] = root
      }
    }
  }
  for (let slot = 0; slot < narrow.count; slot++) parent[slot] = find(slot)
  return parent
}

/**
 * The four groups of bridges: between two cuts or across a neck of one cut,
 * narrow (a warning, limit the minimum bridge) or burnt away (an error: the
 * web is not wider than 0 once the kerf is taken).
 */
function bridgeGroups(findings: FindingCollector, params: AnalysisParams): SiteList[] {
  const facts = { kerfMm: params.kerfMm, thicknessMm: params.thicknessMm, minBridgeMm: params.minBridgeMm }
  const group = (cause: BridgeCause, burnsAway: boolean) =>
    findings.group({ code: 'narrow-bridge', severity: burnsAway ? 'error' : 'warning', cause, limitMm: burnsAway ? 0 : params.minBridgeMm, facts, worstFirst: 'smallest' })
  // Indexed by 2 × (same contour) + (burns away).
  return [group('between-cuts', false), group('between-cuts', true), group('neck', false), group('neck', true)]
}

type BridgeCause = 'between-cuts' | 'neck'

function addBridgeSite(narrow: NearCutList, slot: number, contourOf: Uint32Array, params: AnalysisParams, groups: SiteList[]): void {
  const widthMm = narrow.distanceMm[slot]! - params.kerfMm
  const sameContour = narrow.sameContour[slot] === 1
  const { px, py, qx, qy } = narrow.closest(slot)
  const first = contourOf[narrow.first[slot]!]
  groups[2 * Number(sameContour) + Number(widthMm <= 0)]!.add((px + qx) / 2, (py + qy) / 2, widthMm, first, sameContour ? -1 : contourOf[narrow.second[slot]!])
}
