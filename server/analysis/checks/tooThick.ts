import type { FindingCollector } from '../findings'
import type { AnalysisParams } from '../params'
import { drawingBox } from './drawingBox'
import type { CheckGeometry } from './index'

/** The material is thicker than the cutter can cut: one site at the drawing's corner. */
export function checkThickness(geometry: CheckGeometry, params: AnalysisParams, findings: FindingCollector): void {
  if (params.cutterMaxThicknessMm === undefined || params.thicknessMm <= params.cutterMaxThicknessMm) return
  const [x, y] = drawingBox(geometry)
  findings.group({ code: 'too-thick', severity: 'error', limitMm: params.cutterMaxThicknessMm, facts: { thicknessMm: params.thicknessMm } }).add(x, y, params.thicknessMm)
}
