import type { FindingCollector } from '../findings'
import type { AnalysisParams } from '../params'
import { cutSegmentsOf } from './cutSegments'
import type { CheckGeometry } from './index'
import { nearCutsOf } from './nearCuts'
import { NEAR_KIND } from './pairScan'

/** Cut contours that cross or touch themselves away from their own corners; one site per contour, at its first crossing. */
export function checkSelfIntersections(geometry: CheckGeometry, params: AnalysisParams, findings: FindingCollector): void {
  const segments = cutSegmentsOf(geometry, params)
  const nearCuts = nearCutsOf(geometry, params)
  const { touch } = NEAR_KIND
  const reported = new Set<number>()
  const crossings = findings.group({ code: 'self-intersection', severity: 'warning' })
  for (let slot = 0; slot < nearCuts.count; slot++) {
    const contour = segments.contourOf[nearCuts.first[slot]!]!
    if (nearCuts.sameContour[slot] !== 1 || nearCuts.kind[slot] !== touch || reported.has(contour)) continue
    reported.add(contour)
    const { px, py } = nearCuts.closest(slot)
    crossings.add(px, py, Number.NaN, contour)
  }
}
