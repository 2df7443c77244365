import type { AnalysisParams } from '../params'
import type { Finding } from '../result'
import { cutSegmentsOf } from './cutSegments'
import { formatMm } from './format'
import type { CheckGeometry } from './index'

/**
 * Holes (closed cuts whose inside drops out) smaller than the minimum hole:
 * the diameter when the hole is a circle, otherwise the smaller side of its
 * bounding box.
 */
export function checkSmallHoles(geometry: CheckGeometry, params: AnalysisParams): Finding[] {
  const segments = cutSegmentsOf(geometry)
  const findings: Finding[] = []
  for (let contour = 0; contour < geometry.contours.count; contour++) {
    if (segments.materialSide[contour] === 0 || !segments.isHole(contour)) continue
    const sizeMm = holeSizeMm(geometry, contour, params.chordToleranceMm)
    if (sizeMm >= params.minHoleMm) continue
    const { bounds } = geometry
    findings.push({
      code: 'small-hole',
      severity: 'warning',
      message: `This hole is ${formatMm(sizeMm)} across; the smallest hole for this material and cutter is ${formatMm(params.minHoleMm)}. It may come out misshapen or not cut through.`,
      x: (bounds[4 * contour] + bounds[4 * contour + 2]) / 2,
      y: (bounds[4 * contour + 1] + bounds[4 * contour + 3]) / 2,
      valueMm: sizeMm,
      limitMm: params.minHoleMm,
      contours: [contour],
    })
  }
  return findings
}

// Rounding slack, relative to the radius, when telling whether all points lie on one circle.
const ROUNDING_RELATIVE = 1e-9

/**
 * A flattened circle has its points on the circle (the chords cut inside
 * it), so all lie at one distance from the box centre, up to the chord
 * tolerance the box may miss the extremes by; its diameter is twice that
 * distance. Anything else measures the smaller side of its box.
 */
export function holeSizeMm(geometry: CheckGeometry, contour: number, chordToleranceMm: number): number {
  const { contours, bounds } = geometry
  const centreX = (bounds[4 * contour] + bounds[4 * contour + 2]) / 2
  const centreY = (bounds[4 * contour + 1] + bounds[4 * contour + 3]) / 2
  let nearest = Infinity
  let farthest = 0
  for (let point = contours.start[contour]; point < contours.start[contour + 1]; point++) {
    const radius = Math.hypot(contours.xy[2 * point] - centreX, contours.xy[2 * point + 1] - centreY)
    nearest = Math.min(nearest, radius)
    farthest = Math.max(farthest, radius)
  }
  const isCircle = farthest - nearest <= 2 * chordToleranceMm + ROUNDING_RELATIVE * farthest
  return isCircle ? 2 * farthest : Math.min(bounds[4 * contour + 2] - bounds[4 * contour], bounds[4 * contour + 3] - bounds[4 * contour + 1])
}
