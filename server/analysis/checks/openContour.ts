import type { FindingCollector } from '../findings'
import type { AnalysisParams } from '../params'
import { OPERATION_CODES } from '../polylines'
import type { CheckGeometry } from './index'

/** Ends of an open cut closer than this were probably meant to meet (the project's rule of thumb, no source). */
const NEARLY_CLOSED_GAP_MM = 0.2
// …when the line goes well away and comes back: a short stroke has its ends close too.
const NEARLY_CLOSED_LENGTH_PER_GAP = 10

/** Open cuts: a note for each (slits are normal in fold patterns), a warning when its ends almost meet. */
export function checkOpenContours(geometry: CheckGeometry, params: AnalysisParams, findings: FindingCollector): void {
  const { contours } = geometry
  const slits = findings.group({ code: 'open-contour', severity: 'info', cause: 'slit' })
  const nearlyClosed = findings.group({ code: 'open-contour', severity: 'warning', cause: 'nearly-closed', limitMm: NEARLY_CLOSED_GAP_MM, facts: { chainToleranceMm: params.chainToleranceMm }, worstFirst: 'smallest' })
  for (let contour = 0; contour < contours.count; contour++) {
    if (contours.operation[contour] !== OPERATION_CODES.cut || contours.closed[contour] === 1) continue
    const first = 2 * contours.start[contour]!
    const last = 2 * contours.start[contour + 1]! - 2
    const startX = contours.xy[first]!
    const startY = contours.xy[first + 1]!
    const endX = contours.xy[last]!
    const endY = contours.xy[last + 1]!
    const gapMm = Math.hypot(endX - startX, endY - startY)
    if (gapMm < NEARLY_CLOSED_GAP_MM && contours.lengthMm[contour]! > NEARLY_CLOSED_LENGTH_PER_GAP * gapMm) {
      nearlyClosed.add((startX + endX) / 2, (startY + endY) / 2, gapMm, contour)
    } else {
      slits.add(startX, startY, Number.NaN, contour)
    }
  }
}
