import type { AnalysisParams } from '../params'
import type { Finding } from '../result'
import { drawingBox } from './drawingBox'
import { formatMm } from './format'
import type { CheckGeometry } from './index'

/** The material is thicker than the cutter can cut. */
export function checkThickness(geometry: CheckGeometry, params: AnalysisParams): Finding[] {
  if (params.cutterMaxThicknessMm === undefined || params.thicknessMm <= params.cutterMaxThicknessMm) return []
  const [x, y] = drawingBox(geometry)
  return [
    {
      code: 'too-thick',
      severity: 'error',
      message: `The material is ${formatMm(params.thicknessMm)} thick; this cutter cuts at most ${formatMm(params.cutterMaxThicknessMm)}.`,
      x,
      y,
      valueMm: params.thicknessMm,
      limitMm: params.cutterMaxThicknessMm,
    },
  ]
}
