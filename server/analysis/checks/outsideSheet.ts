import type { FindingCollector } from '../findings'
import type { AnalysisParams } from '../params'
import { fitOnSheet } from '../sheetFit'
import { drawingBox } from './drawingBox'
import type { CheckGeometry } from './index'

/**
 * Geometry beyond the usable area (less the margin on every side) when the
 * drawing fits neither way round: an error beyond the bed, a warning beyond
 * only the chosen sheet. The drawing is placed with its box at the usable
 * area's corner, as drawn; the lines that then stick out are counted and
 * boxed (facts of the group, never a list of ids).
 */
export function checkOutsideSheet(geometry: CheckGeometry, params: AnalysisParams, findings: FindingCollector): void {
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
  if (!fit.fitsBed) beyond(geometry, params, 'bed', params.bedWidthMm, params.bedHeightMm, findings)
  else if (!fit.fits) beyond(geometry, params, 'sheet', Math.min(params.sheetWidthMm, params.bedWidthMm), Math.min(params.sheetHeightMm, params.bedHeightMm), findings)
}

function beyond(geometry: CheckGeometry, params: AnalysisParams, area: 'sheet' | 'bed', areaWidthMm: number, areaHeightMm: number, findings: FindingCollector): void {
  const [minX, minY, maxX, maxY] = drawingBox(geometry)
  const usableWidthMm = areaWidthMm - 2 * params.marginMm
  const usableHeightMm = areaHeightMm - 2 * params.marginMm
  const { bounds } = geometry
  // The lines that stick out: how many, and the box round them.
  let outside = 0
  const box: [number, number, number, number] = [Infinity, Infinity, -Infinity, -Infinity]
  for (let contour = 0; contour < geometry.contours.count; contour++) {
    if (!(bounds[4 * contour + 2]! - minX > usableWidthMm || bounds[4 * contour + 3]! - minY > usableHeightMm)) continue
    outside++
    for (let side = 0; side < 2; side++) box[side] = Math.min(box[side]!, bounds[4 * contour + side]!)
    for (let side = 2; side < 4; side++) box[side] = Math.max(box[side]!, bounds[4 * contour + side]!)
  }
  const widthOverMm = maxX - minX - usableWidthMm
  const heightOverMm = maxY - minY - usableHeightMm
  const acrossIsWorse = widthOverMm >= heightOverMm
  const facts = {
    drawingWidthMm: maxX - minX,
    drawingHeightMm: maxY - minY,
    usableWidthMm,
    usableHeightMm,
    marginMm: params.marginMm,
    linesOutside: outside,
    outsideMinXMm: box[0],
    outsideMinYMm: box[1],
    outsideMaxXMm: box[2],
    outsideMaxYMm: box[3],
  }
  findings
    .group({ code: 'outside-sheet', severity: area === 'bed' ? 'error' : 'warning', cause: area === 'bed' ? 'beyond-bed' : 'beyond-sheet', limitMm: acrossIsWorse ? usableWidthMm : usableHeightMm, facts })
    .add(Math.min(maxX, minX + usableWidthMm), Math.min(maxY, minY + usableHeightMm), acrossIsWorse ? maxX - minX : maxY - minY)
}
