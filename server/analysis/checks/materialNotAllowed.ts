import type { FindingCollector } from '../findings'
import type { AnalysisParams } from '../params'
import { drawingBox } from './drawingBox'
import type { CheckGeometry } from './index'

/** The workshop's rule says this cutter kind must not cut this material; the reason is the safety reason staff gave (a fact of the group). */
export function checkMaterialAllowed(geometry: CheckGeometry, params: AnalysisParams, findings: FindingCollector): void {
  if (params.materialAllowed === undefined || params.materialAllowed.allowed) return
  const [x, y] = drawingBox(geometry)
  findings.group({ code: 'material-not-allowed', severity: 'error', facts: { reason: params.materialAllowed.reason } }).add(x, y)
}
