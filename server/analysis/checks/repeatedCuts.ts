import type { AnalysisParams } from '../params'
import type { PolylineSet } from '../polylines'
import { type CutSegments, cutSegmentsOf } from './cutSegments'
import type { CheckGeometry } from './index'
import { oncePerGeometry } from './memo'
import { stretchWithin } from './segmentGeometry'

/** Where cuts repeat each other: the machine would cut the same line twice. */
export interface RepeatedCuts {
  /** Keys (see `contourPairKey`) of contour pairs that repeat each other somewhere, a contour with itself included. */
  repeatingPairs: Set<number>
  /** Per contour pair: the length cut a second time and the middle of the first repeated stretch. */
  sites: Map<number, { contours: number[]; lengthMm: number; x: number; y: number }>
}

/**
 * Two flattenings of one curve differ by up to a chord tolerance each, and
 * ends within the chaining tolerance count as one point; lines closer than
 * that are the same line.
 */
export function repeatToleranceMm(params: AnalysisParams): number {
  return 2 * params.chordToleranceMm + params.chainToleranceMm
}

// Segments more than about 10° apart cross rather than run along each other.
const PARALLEL_SINE = Math.sin((10 * Math.PI) / 180)
// A shared stretch shorter than this many tolerances is a touch at a corner, not a repeat.
const SHORTEST_REPEAT_IN_TOLERANCES = 2

export function contourPairKey(contours: PolylineSet, first: number, second: number): number {
  return Math.min(first, second) * contours.count + Math.max(first, second)
}

/**
 * For each segment, the stretches of it that lie within the tolerance of an
 * earlier, nearly parallel cut segment; their union is cut a second time (a
 * line drawn three times adds two extra passes, counted once per later copy).
 */
function findRepeatedCuts(geometry: CheckGeometry, params: AnalysisParams): RepeatedCuts {
  const segments = cutSegmentsOf(geometry)
  const toleranceMm = repeatToleranceMm(params)
  const coveredBy = new Map<number, { from: number; to: number; earlier: number }[]>()
  segments.forEachPairWithin(toleranceMm, (earlier, later) => {
    const stretch = repeatedStretch(segments, earlier, later, toleranceMm)
    if (stretch === null) return
    const list = coveredBy.get(later) ?? []
    list.push({ from: stretch[0], to: stretch[1], earlier })
    coveredBy.set(later, list)
  })
  const result: RepeatedCuts = { repeatingPairs: new Set(), sites: new Map() }
  for (const [later, stretches] of coveredBy) {
    const [cx, cy, dx, dy] = segments.ends(later)
    const lengthMm = unionLength(stretches) * Math.hypot(dx - cx, dy - cy)
    const contours = [segments.contourOf[stretches[0].earlier], segments.contourOf[later]]
    const key = contourPairKey(segments.contours, contours[0], contours[1])
    result.repeatingPairs.add(key)
    const site = result.sites.get(key)
    if (site !== undefined) {
      site.lengthMm += lengthMm
      continue
    }
    const middle = (stretches[0].from + stretches[0].to) / 2
    result.sites.set(key, { contours: contours[0] === contours[1] ? [contours[0]] : contours, lengthMm, x: cx + middle * (dx - cx), y: cy + middle * (dy - cy) })
  }
  return result
}

/** Whether two segments run along each other within the repeat tolerance. */
export function isRepeatedStretch(segments: CutSegments, first: number, second: number, params: AnalysisParams): boolean {
  return repeatedStretch(segments, first, second, repeatToleranceMm(params)) !== null
}

/** The stretch of `later` (as parameters) running along `earlier` within the tolerance, or null. */
function repeatedStretch(segments: CutSegments, earlier: number, later: number, toleranceMm: number): [number, number] | null {
  const [ax, ay, bx, by] = segments.ends(earlier)
  const [cx, cy, dx, dy] = segments.ends(later)
  const earlierLength = Math.hypot(bx - ax, by - ay)
  const laterLength = Math.hypot(dx - cx, dy - cy)
  if (earlierLength === 0 || laterLength === 0) return null
  const sine = Math.abs((bx - ax) * (dy - cy) - (by - ay) * (dx - cx)) / (earlierLength * laterLength)
  if (sine > PARALLEL_SINE) return null
  const stretch = stretchWithin(ax, ay, bx, by, cx, cy, dx, dy, toleranceMm)
  if (stretch === null || (stretch[1] - stretch[0]) * laterLength < SHORTEST_REPEAT_IN_TOLERANCES * toleranceMm) return null
  return stretch
}

function unionLength(stretches: { from: number; to: number }[]): number {
  const sorted = [...stretches].sort((a, b) => a.from - b.from)
  let total = 0
  let runFrom = sorted[0].from
  let runTo = sorted[0].to
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
export const repeatedCutsOf = oncePerGeometry((params) => String(repeatToleranceMm(params)), findRepeatedCuts)
