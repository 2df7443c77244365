import type { AnalysisParams } from '../params'
import type { Finding } from '../result'
import { cutSegmentsOf } from './cutSegments'
import type { CheckGeometry } from './index'
import { nearCutsOf } from './nearCuts'
import { NEAR_KIND } from './pairScan'

/** Cut contours that cross or touch themselves away from their own corners; one finding per contour, at its first crossing. */
export function checkSelfIntersections(geometry: CheckGeometry, params: AnalysisParams): Finding[] {
  const segments = cutSegmentsOf(geometry)
  const nearCuts = nearCutsOf(geometry, params)
  const { touch } = NEAR_KIND
  const reported = new Set<number>()
  const findings: Finding[] = []
  for (let slot = 0; slot < nearCuts.count; slot++) {
    const contour = segments.contourOf[nearCuts.first[slot]]
    if (nearCuts.sameContour[slot] !== 1 || nearCuts.kind[slot] !== touch || reported.has(contour)) continue
    reported.add(contour)
    const { px, py } = nearCuts.closest(slot)
    findings.push({
      code: 'self-intersection',
      severity: 'warning',
      message: 'This cut crosses or touches itself. The machine follows it as drawn, but which piece drops out is unclear; redraw it as one outline that does not cross.',
      x: px,
      y: py,
      contours: [contour],
    })
  }
  return findings
}
