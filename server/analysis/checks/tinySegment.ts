import type { AnalysisParams } from '../params'
import { OPERATION_CODES } from '../polylines'
import type { Finding } from '../result'
import { formatMm } from './format'
import type { CheckGeometry } from './index'

/**
 * A cut or score shorter than twice the kerf leaves a burnt dot rather than a
 * line and still costs a pierce (the project's rule, no source): usually a
 * stray bit of drawing.
 */
function tinySegmentLimitMm(params: AnalysisParams): number {
  return 2 * params.kerfMm
}

export function checkTinySegments(geometry: CheckGeometry, params: AnalysisParams): Finding[] {
  const { contours, bounds } = geometry
  const limitMm = tinySegmentLimitMm(params)
  const findings: Finding[] = []
  for (let contour = 0; contour < contours.count; contour++) {
    if (contours.operation[contour] === OPERATION_CODES.engrave || contours.lengthMm[contour] >= limitMm) continue
    findings.push({
      code: 'tiny-segment',
      severity: 'warning',
      message: `A line only ${formatMm(contours.lengthMm[contour])} long: it burns a dot and costs a pierce. Delete it unless it is meant.`,
      x: (bounds[4 * contour] + bounds[4 * contour + 2]) / 2,
      y: (bounds[4 * contour + 1] + bounds[4 * contour + 3]) / 2,
      valueMm: contours.lengthMm[contour],
      limitMm,
      contours: [contour],
    })
  }
  return findings
}
