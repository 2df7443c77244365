import type { FindingCollector } from '../findings'
import type { AnalysisParams } from '../params'
import { OPERATION_CODES } from '../polylines'
import type { CheckGeometry } from './index'

/**
 * A cut or score shorter than twice the kerf leaves a burnt dot rather than a
 * line and still costs a pierce (the project's rule, no source): usually a
 * stray bit of drawing.
 */
function tinySegmentLimitMm(params: AnalysisParams): number {
  return 2 * params.kerfMm
}

export function checkTinySegments(geometry: CheckGeometry, params: AnalysisParams, findings: FindingCollector): void {
  const { contours, bounds } = geometry
  const limitMm = tinySegmentLimitMm(params)
  const dots = findings.group({ code: 'tiny-segment', severity: 'warning', limitMm, facts: { kerfMm: params.kerfMm }, worstFirst: 'smallest' })
  for (let contour = 0; contour < contours.count; contour++) {
    if (contours.operation[contour] === OPERATION_CODES.engrave || contours.lengthMm[contour]! >= limitMm) continue
    const middleX = (bounds[4 * contour]! + bounds[4 * contour + 2]!) / 2
    const middleY = (bounds[4 * contour + 1]! + bounds[4 * contour + 3]!) / 2
    dots.add(middleX, middleY, contours.lengthMm[contour], contour)
  }
}
