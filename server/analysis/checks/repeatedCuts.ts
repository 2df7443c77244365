import type { AnalysisParams } from '../params'
import { cutSegmentsOf } from './cutSegments'
import type { CheckGeometry } from './index'
import { oncePerGeometry } from '../memo'
import { contourPairKey, pairScanOf, pairScanSignature, type RepeatedStretch } from './pairScan'

/** Where cuts repeat each other: the machine would cut the same line twice. */
export interface RepeatedCuts {
  /** Keys (see `contourPairKey`) of contour pairs that repeat each other somewhere, a contour with itself included. */
  repeatingPairs: Set<number>
  /** Per contour pair: the length cut a second time and the middle of the first repeated stretch. */
  sites: Map<number, { contours: number[]; lengthMm: number; x: number; y: number }>
}

/**
 * For each segment, the stretches of it that lie within the tolerance of an
 * earlier, nearly parallel cut segment; their union is cut a second time (a
 * line drawn three times adds two extra passes, counted once per later copy).
 */
function findRepeatedCuts(geometry: CheckGeometry, params: AnalysisParams): RepeatedCuts {
  const segments = cutSegmentsOf(geometry, params)
  const result: RepeatedCuts = { repeatingPairs: new Set(), sites: new Map() }
  for (const [later, stretches] of pairScanOf(geometry, params).repeatsOf) {
    const [cx, cy, dx, dy] = segments.ends(later)
    const lengthMm = unionLength(stretches) * Math.hypot(dx - cx, dy - cy)
    const contours: [number, number] = [segments.contourOf[stretches[0]!.earlier]!, segments.contourOf[later]!]
    const key = contourPairKey(segments.contours, contours[0], contours[1])
    result.repeatingPairs.add(key)
    const site = result.sites.get(key)
    if (site !== undefined) {
      site.lengthMm += lengthMm
      continue
    }
    const middle = (stretches[0]!.from + stretches[0]!.to) / 2
    result.sites.set(key, {
      contours: contours[0] === contours[1] ? [contours[0]] : contours,
      lengthMm,
      x: cx + middle * (dx - cx),
      y: cy + middle * (dy - cy),
    })
  }
  return result
}

function unionLength(stretches: RepeatedStretch[]): number {
  const sorted = [...stretches].sort((a, b) => a.from - b.from)
  let total = 0
  let runFrom = sorted[0]!.from
  let runTo = sorted[0]!.to
  for (const { from, to } of sorted.slice(1)) {
    if (from > runTo) {
      total += runTo - runFrom
      runFrom = from
    }
    runTo = Math.max(runTo, to)
  }
  return total + runTo - runFrom
}

/** Repeated cuts of a geometry, found once for the checks that need them. */
export const repeatedCutsOf = oncePerGeometry(pairScanSignature, findRepeatedCuts)
