import type { AnalysisParams } from '../params'
import type { Finding } from '../result'
import { cutSegmentsOf } from './cutSegments'
import type { CheckGeometry } from './index'
import { nearCutsOf } from './nearCuts'

/** Cut contours that cross or touch themselves away from their own corners; one finding per contour, at its first crossing. */
export function checkSelfIntersections(geometry: CheckGeometry, params: AnalysisParams): Finding[] {
  const segments = cutSegmentsOf(geometry)
  const reported = new Set<number>()
  const findings: Finding[] = []
  for (const near of nearCutsOf(geometry, params)) {
    const contour = segments.contourOf[near.first]
    if (!near.sameContour || near.kind !== 'touch' || reported.has(contour)) continue
    reported.add(contour)
    findings.push({
      code: 'self-intersection',
      severity: 'warning',
      message: 'This cut crosses or touches itself. The machine follows it as drawn, but which piece drops out is unclear; redraw it as one outline that does not cross.',
      x: near.px,
      y: near.py,
      contours: [contour],
    })
  }
  return findings
}
