import { hypot } from './distance'

// svg-path-properties 2.1.0 measures an arc by 300 chords (its approximateArcLengthOfCurve with 300 steps).
const CHORDS = 300
const FULL_TURN_RAD = 2 * Math.PI

/**
 * The length svg-path-properties 2.1.0 gives the arc "M0 0A rx ry rotation
 * large sweep x y", bit for bit: the same arithmetic as its
 * pointOnEllipticalArc, term for term, at the same 301 parameters, and the
 * chords summed in the same order. The library recomputes the arc's centre
 * for every point and allocates objects for each; here the centre is found
 * once and the points are plain numbers (tests/analysis/arcLength.test.ts
 * compares the two on random arcs).
 */
export function arcLengthFromOrigin(rxGiven: number, ryGiven: number, rotationDeg: number, largeArc: boolean, sweep: boolean, toX: number, toY: number): number {
  // An arc that ends where it starts, or has a zero radius, is a point for every parameter: length 0.
  if ((0 === toX && 0 === toY) || rxGiven === 0 || ryGiven === 0) return 0
  let rx = Math.abs(rxGiven)
  let ry = Math.abs(ryGiven)
  const rotation = ((rotationDeg % 360) + 360) % 360
  const rotationRad = rotation * (Math.PI / 180)
  const cos = Math.cos(rotationRad)
  const sin = Math.sin(rotationRad)
  const halfX = (0 - toX) / 2
  const halfY = (0 - toY) / 2
  const primeX = cos * halfX + sin * halfY
  const primeY = -sin * halfX + cos * halfY
  const scale = Math.pow(primeX, 2) / Math.pow(rx, 2) + Math.pow(primeY, 2) / Math.pow(ry, 2)
  if (scale > 1) {
    rx = Math.sqrt(scale) * rx
    ry = Math.sqrt(scale) * ry
  }
  let root =
    (Math.pow(rx, 2) * Math.pow(ry, 2) - Math.pow(rx, 2) * Math.pow(primeY, 2) - Math.pow(ry, 2) * Math.pow(primeX, 2)) /
    (Math.pow(rx, 2) * Math.pow(primeY, 2) + Math.pow(ry, 2) * Math.pow(primeX, 2))
  root = root < 0 ? 0 : root
  const factor = (largeArc !== sweep ? 1 : -1) * Math.sqrt(root)
  const centrePrimeX = factor * ((rx * primeY) / ry)
  const centrePrimeY = factor * ((-ry * primeX) / rx)
  const centreX = cos * centrePrimeX - sin * centrePrimeY + (0 + toX) / 2
  const centreY = sin * centrePrimeX + cos * centrePrimeY + (0 + toY) / 2
  const startX = (primeX - centrePrimeX) / rx
  const startY = (primeY - centrePrimeY) / ry
  const startAngle = angleBetween(1, 0, startX, startY)
  let sweepAngle = angleBetween(startX, startY, (-primeX - centrePrimeX) / rx, (-primeY - centrePrimeY) / ry)
  if (!sweep && sweepAngle > 0) sweepAngle -= FULL_TURN_RAD
  else if (sweep && sweepAngle < 0) sweepAngle += FULL_TURN_RAD
  sweepAngle %= FULL_TURN_RAD

  // The point at parameter t, as the library computes it (its x and y share one angle).
  let pointX = 0
  let pointY = 0
  const pointAt = (t: number) => {
    const angle = startAngle + sweepAngle * t
    const alongX = rx * Math.cos(angle)
    const alongY = ry * Math.sin(angle)
    pointX = cos * alongX - sin * alongY + centreX
    pointY = sin * alongX + cos * alongY + centreY
  }
  pointAt(0)
  let lengthMm = 0
  let previousX = pointX
  let previousY = pointY
  for (let step = 0; step < CHORDS; step++) {
    pointAt(Math.min(Math.max(step * (1 / CHORDS), 0), 1))
    lengthMm += hypot(pointX - previousX, pointY - previousY)
    previousX = pointX
    previousY = pointY
  }
  pointAt(1)
  return lengthMm + hypot(pointX - previousX, pointY - previousY)
}

/** svg-path-properties' angleBetween of two vectors, term for term. */
function angleBetween(ux: number, uy: number, vx: number, vy: number): number {
  const dot = ux * vx + uy * vy
  const lengths = Math.hypot(ux, uy) * Math.hypot(vx, vy)
  return (ux * vy - uy * vx < 0 ? -1 : 1) * Math.acos(dot / lengths)
}
