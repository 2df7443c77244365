import type { AnalysisParams } from '../params'
import type { Finding } from '../result'
import { fitOnSheet } from '../sheetFit'
import { drawingBox } from './drawingBox'
import { formatMm } from './format'
import type { CheckGeometry } from './index'

/**
 * Geometry beyond the usable area (less the margin on every side) when the
 * drawing fits neither way round: an error beyond the bed, a warning beyond
 * only the chosen sheet. The drawing is placed with its box at the usable
 * area's corner, as drawn; the contours that then stick out are listed.
 */
export function checkOutsideSheet(geometry: CheckGeometry, params: AnalysisParams): Finding[] {
  const [minX, minY, maxX, maxY] = drawingBox(geometry)
  const fit = fitOnSheet({
    partWidthMm: maxX - minX,
    partHeightMm: maxY - minY,
    sheetWidthMm: params.sheetWidthMm,
    sheetHeightMm: params.sheetHeightMm,
    bedWidthMm: params.bedWidthMm,
    bedHeightMm: params.bedHeightMm,
    marginMm: params.marginMm,
    spacingMm: 0,
  })
  if (!fit.fitsBed) return [beyond(geometry, params, 'bed', params.bedWidthMm, params.bedHeightMm)]
  if (!fit.fits) return [beyond(geometry, params, 'sheet', Math.min(params.sheetWidthMm, params.bedWidthMm), Math.min(params.sheetHeightMm, params.bedHeightMm))]
  return []
}

function beyond(geometry: CheckGeometry, params: AnalysisParams, area: 'sheet' | 'bed', areaWidthMm: number, areaHeightMm: number): Finding {
  const [minX, minY, maxX, maxY] = drawingBox(geometry)
  const usableWidthMm = areaWidthMm - 2 * params.marginMm
  const usableHeightMm = areaHeightMm - 2 * params.marginMm
  const { bounds } = geometry
  const outside: number[] = []
  for (let contour = 0; contour < geometry.contours.count; contour++) {
    if (bounds[4 * contour + 2] - minX > usableWidthMm || bounds[4 * contour + 3] - minY > usableHeightMm) outside.push(contour)
  }
  const widthOverMm = maxX - minX - usableWidthMm
  const heightOverMm = maxY - minY - usableHeightMm
  const acrossIsWorse = widthOverMm >= heightOverMm
  const what = area === 'bed' ? "the cutter's bed" : 'the chosen sheet'
  return {
    code: 'outside-sheet',
    severity: area === 'bed' ? 'error' : 'warning',
    message: `The drawing is ${formatMm(maxX - minX)} × ${formatMm(maxY - minY)}; ${what} leaves ${formatMm(usableWidthMm)} × ${formatMm(usableHeightMm)} after the ${formatMm(params.marginMm)} margin, and it does not fit either way round. ${outside.length} of its lines lie beyond.`,
    x: Math.min(maxX, minX + usableWidthMm),
    y: Math.min(maxY, minY + usableHeightMm),
    valueMm: acrossIsWorse ? maxX - minX : maxY - minY,
    limitMm: acrossIsWorse ? usableWidthMm : usableHeightMm,
    contours: outside,
  }
}
