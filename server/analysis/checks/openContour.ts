import type { AnalysisParams } from '../params'
import { OPERATION_CODES } from '../polylines'
import type { Finding } from '../result'
import { formatMm } from './format'
import type { CheckGeometry } from './index'

/** Ends of an open cut closer than this were probably meant to meet (the project's rule of thumb, no source). */
const NEARLY_CLOSED_GAP_MM = 0.2
// …when the line goes well away and comes back: a short stroke has its ends close too.
const NEARLY_CLOSED_LENGTH_PER_GAP = 10

/** Open cuts: a note for each (slits are normal in fold patterns), a warning when its ends almost meet. */
export function checkOpenContours(geometry: CheckGeometry, params: AnalysisParams): Finding[] {
  const { contours } = geometry
  const findings: Finding[] = []
  for (let contour = 0; contour < contours.count; contour++) {
    if (contours.operation[contour] !== OPERATION_CODES.cut || contours.closed[contour] === 1) continue
    const first = 2 * contours.start[contour]
    const last = 2 * contours.start[contour + 1] - 2
    const startX = contours.xy[first]
    const startY = contours.xy[first + 1]
    const endX = contours.xy[last]
    const endY = contours.xy[last + 1]
    const gapMm = Math.hypot(endX - startX, endY - startY)
    findings.push(
      gapMm < NEARLY_CLOSED_GAP_MM && contours.lengthMm[contour] > NEARLY_CLOSED_LENGTH_PER_GAP * gapMm
        ? {
            code: 'open-contour',
            severity: 'warning',
            message: `The ends of this outline are only ${formatMm(gapMm)} apart, so it is cut as an open line and nothing drops out. Close it if it should be a shape (the chaining tolerance is ${formatMm(params.chainToleranceMm)}).`,
            x: (startX + endX) / 2,
            y: (startY + endY) / 2,
            valueMm: gapMm,
            limitMm: NEARLY_CLOSED_GAP_MM,
            contours: [contour],
          }
        : {
            code: 'open-contour',
            severity: 'info',
            message: 'An open cut (a slit): cut as a line, nothing drops out.',
            x: startX,
            y: startY,
            contours: [contour],
          },
    )
  }
  return findings
}
