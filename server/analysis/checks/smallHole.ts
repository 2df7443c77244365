import type { FindingCollector } from '../findings'
import type { AnalysisParams } from '../params'
import { cutSegmentsOf } from './cutSegments'
import type { CheckGeometry } from './index'

/**
 * Holes (closed cuts whose inside drops out) smaller than the minimum hole:
 * the diameter when the hole is a circle, otherwise the smaller side of its
 * bounding box.
 */
export function checkSmallHoles(geometry: CheckGeometry, params: AnalysisParams, findings: FindingCollector): void {
  const segments = cutSegmentsOf(geometry, params)
  const holes = findings.group({ code: 'small-hole', severity: 'warning', limitMm: params.minHoleMm, facts: { thicknessMm: params.thicknessMm }, worstFirst: 'smallest' })
  const { bounds } = geometry
  for (let contour = 0; contour < geometry.contours.count; contour++) {
    if (segments.materialSide[contour] === 0 || !segments.isHole(contour)) continue
    const sizeMm = holeSizeMm(geometry, contour, params.chordToleranceMm)
    if (sizeMm >= params.minHoleMm) continue
    holes.add((bounds[4 * contour] + bounds[4 * contour + 2]) / 2, (bounds[4 * contour + 1] + bounds[4 * contour + 3]) / 2, sizeMm, contour)
  }
}

// Rounding slack, relative to the radius, when telling whether points lie on one circle.
const ROUNDING_RELATIVE = 1e-9

/**
 * The diameter when the contour is a flattened circle, otherwise the smaller
 * side of its box. A flattened circle has every point on the circle and every
 * chord within the chord tolerance inside it; a polygon with its corners on
 * a circle (a rectangle) fails the second test.
 */
function holeSizeMm(geometry: CheckGeometry, contour: number, chordToleranceMm: number): number {
  const { contours, bounds } = geometry
  const boxSideMm = Math.min(bounds[4 * contour + 2] - bounds[4 * contour], bounds[4 * contour + 3] - bounds[4 * contour + 1])
  const circle = fittedCircle(contours, contour)
  if (circle === null) return boxSideMm
  const slackMm = ROUNDING_RELATIVE * circle.radiusMm
  const { xy } = contours
  for (let point = contours.start[contour]; point < contours.start[contour + 1] - 1; point++) {
    const x = xy[2 * point]
    const y = xy[2 * point + 1]
    const nextX = xy[2 * point + 2]
    const nextY = xy[2 * point + 3]
    if (Math.abs(Math.hypot(x - circle.x, y - circle.y) - circle.radiusMm) > slackMm) return boxSideMm
    if (Math.hypot((x + nextX) / 2 - circle.x, (y + nextY) / 2 - circle.y) < circle.radiusMm - chordToleranceMm - slackMm) return boxSideMm
  }
  return 2 * circle.radiusMm
}

/**
 * Least-squares circle through the contour's points (Kåsa's algebraic fit:
 * x² + y² + D·x + E·y + F = 0 is linear in D, E, F), exact when the points
 * lie on a circle. Coordinates are taken about their mean for precision.
 */
function fittedCircle(contours: CheckGeometry['contours'], contour: number): { x: number; y: number; radiusMm: number } | null {
  const first = contours.start[contour]
  const end = contours.start[contour + 1] - 1
  const count = end - first
  if (count < 3) return null
  const { xy } = contours
  let meanX = 0
  let meanY = 0
  for (let point = first; point < end; point++) {
    meanX += xy[2 * point] / count
    meanY += xy[2 * point + 1] / count
  }
  // Normal equations of Σ (u² + v² + D·u + E·v + F)² for centred u, v.
  let suu = 0, svv = 0, suv = 0, suuu = 0, svvv = 0, suvv = 0, svuu = 0
  for (let point = first; point < end; point++) {
    const u = xy[2 * point] - meanX
    const v = xy[2 * point + 1] - meanY
    suu += u * u
    svv += v * v
    suv += u * v
    suuu += u * u * u
    svvv += v * v * v
    suvv += u * v * v
    svuu += v * u * u
  }
  // With centred coordinates Σu = Σv = 0, so the centre (uc, vc) solves a 2 × 2 system.
  const determinant = suu * svv - suv * suv
  if (determinant === 0) return null
  const rightU = (suuu + suvv) / 2
  const rightV = (svvv + svuu) / 2
  const centreU = (rightU * svv - rightV * suv) / determinant
  const centreV = (suu * rightV - suv * rightU) / determinant
  const radiusMm = Math.sqrt(centreU * centreU + centreV * centreV + (suu + svv) / count)
  return { x: centreU + meanX, y: centreV + meanY, radiusMm }
}
