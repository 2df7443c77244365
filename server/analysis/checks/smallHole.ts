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
    holes.add((bounds[4 * contour]! + bounds[4 * contour + 2]!) / 2, (bounds[4 * contour + 1]! + bounds[4 * contour + 3]!) / 2, sizeMm, contour)
  }
}

// How far, relative to the radius, points may lie off the fitted circle and still be one: a circular arc drawn as
// cubic Béziers of up to a quarter turn (as svgpath's arc conversion draws it) strays up to 2.7e-4·r from the circle
// (the standard quarter-circle cubic, control distance 4/3·tan(θ/4)·r, has its largest radial error 2.7e-4·r), and
// coordinates written with 6 decimals move each point up to 7e-7 mm (1.4e-6·r for a 1 mm hole). A polygon whose
// corners lie on a circle still fails the chord test below. Common practice, no source: 1e-3·r, with 1e-6 mm so
// that holes a few micrometres across are not held to float precision.
const ON_CIRCLE_RELATIVE = 1e-3
const ON_CIRCLE_ABSOLUTE_MM = 1e-6

/**
 * The diameter when the contour is a flattened circle, otherwise the smaller
 * side of its box. A flattened circle has every point on the circle and every
 * chord within the chord tolerance inside it; a polygon with its corners on
 * a circle (a rectangle) fails the second test.
 */
function holeSizeMm(geometry: CheckGeometry, contour: number, chordToleranceMm: number): number {
  const { contours, bounds } = geometry
  const boxSideMm = Math.min(bounds[4 * contour + 2]! - bounds[4 * contour]!, bounds[4 * contour + 3]! - bounds[4 * contour + 1]!)
  const circle = fittedCircle(contours, contour)
  if (circle === null) return boxSideMm
  const slackMm = ON_CIRCLE_RELATIVE * circle.radiusMm + ON_CIRCLE_ABSOLUTE_MM
  const { xy } = contours
  // Flattened curves keep their ends on the circle and bulge out between them (a cubic's arc lies outside the
  // circle): the nearest point is the drawn radius, which the least-squares radius overshoots by up to ~1e-4·r.
  let nearestMm = Infinity
  for (let point = contours.start[contour]!; point < contours.start[contour + 1]! - 1; point++) {
    const x = xy[2 * point]!
    const y = xy[2 * point + 1]!
    const nextX = xy[2 * point + 2]!
    const nextY = xy[2 * point + 3]!
    const distanceMm = Math.hypot(x - circle.x, y - circle.y)
    if (Math.abs(distanceMm - circle.radiusMm) > slackMm) return boxSideMm
    if (distanceMm < nearestMm) nearestMm = distanceMm
    if (Math.hypot((x + nextX) / 2 - circle.x, (y + nextY) / 2 - circle.y) < circle.radiusMm - chordToleranceMm - slackMm) return boxSideMm
  }
  return 2 * nearestMm
}

/**
 * Least-squares circle through the contour's points (Kåsa's algebraic fit:
 * x² + y² + D·x + E·y + F = 0 is linear in D, E, F), exact when the points
 * lie on a circle. Coordinates are taken about their mean for precision.
 */
function fittedCircle(contours: CheckGeometry['contours'], contour: number): { x: number; y: number; radiusMm: number } | null {
  const first = contours.start[contour]!
  const end = contours.start[contour + 1]! - 1
  const count = end - first
  if (count < 3) return null
  const { xy } = contours
  let meanX = 0
  let meanY = 0
  for (let point = first; point < end; point++) {
    meanX += xy[2 * point]! / count
    meanY += xy[2 * point + 1]! / count
  }
  // Normal equations of Σ (u² + v² + D·u + E·v + F)² for centred u, v.
  let suu = 0, svv = 0, suv = 0, suuu = 0, svvv = 0, suvv = 0, svuu = 0
  for (let point = first; point < end; point++) {
    const u = xy[2 * point]! - meanX
    const v = xy[2 * point + 1]! - meanY
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
