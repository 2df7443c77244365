import type { AnalysisParams } from '../params'
import type { Finding } from '../result'
import { drawingBox } from './drawingBox'
import type { CheckGeometry } from './index'

/** The workshop's rule says this cutter kind must not cut this material; the reason is the safety reason staff gave. */
export function checkMaterialAllowed(geometry: CheckGeometry, params: AnalysisParams): Finding[] {
  if (params.materialAllowed === undefined || params.materialAllowed.allowed) return []
  const [x, y] = drawingBox(geometry)
  return [{ code: 'material-not-allowed', severity: 'error', message: `This material may not be cut on this cutter: ${params.materialAllowed.reason}`, x, y }]
}
