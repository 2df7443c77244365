// svg-path-properties 2.1.0's arithmetic for the lengths of arcs and cubic curves, ported so that the engine
// measures each distinct curve without the library's objects, bit for bit the library's answer
// (tests/analysis/curveLengthPort.test.ts compares the two on random curves).
import { hypot } from './distance'

// svg-path-properties 2.1.0 measures an arc by 300 chords (its approximateArcLengthOfCurve with 300 steps).
const CHORDS = 300
const FULL_TURN_RAD = 2 * Math.PI

/**
 * The length svg-path-properties gives the arc "M0 0A rx ry rotation large
 * sweep x y": the same arithmetic as its pointOnEllipticalArc, term for
 * term, at the same 301 parameters, and the chords summed in the same order.
 * The library recomputes the arc's centre for every point and allocates
 * objects for each; here the centre is found once and the points are plain
 * numbers.
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

// The library's 20-point Gauss–Legendre abscissae and weights on [−1, 1], in its order (the published values, as its doubles).
const GAUSS_NODES = [
  -0.07652652113349734, 0.07652652113349734, -0.22778585114164507, 0.22778585114164507, -0.37370608871541955, 0.37370608871541955, -0.5108670019508271, 0.5108670019508271,
  -0.636053680726515, 0.636053680726515, -0.7463319064601508, 0.7463319064601508, -0.8391169718222188, 0.8391169718222188, -0.912234428251326, 0.912234428251326,
  -0.9639719272779138, 0.9639719272779138, -0.9931285991850949, 0.9931285991850949,
]
const GAUSS_WEIGHTS = [
  0.15275338713072584, 0.15275338713072584, 0.14917298647260374, 0.14917298647260374, 0.14209610931838204, 0.14209610931838204, 0.13168863844917664, 0.13168863844917664,
  0.11819453196151841, 0.11819453196151841, 0.10193011981724044, 0.10193011981724044, 0.08327674157670475, 0.08327674157670475, 0.06267204833410907, 0.06267204833410907,
  0.04060142980038694, 0.04060142980038694, 0.017614007139152118, 0.017614007139152118,
]

/**
 * The length svg-path-properties gives the cubic "M0 0C x1 y1 x2 y2 x3 y3":
 * its getCubicArcLength (Gauss–Legendre quadrature of the speed over t in
 * [0, 1] with 20 nodes), with the derivative as its getDerivative forms it
 * (3 × the control point differences, then the quadratic Bernstein sum with
 * Math.pow), term for term.
 */
export function cubicLengthFromOrigin(x1: number, y1: number, x2: number, y2: number, x3: number, y3: number): number {
  const dx0 = 3 * (x1 - 0)
  const dx1 = 3 * (x2 - x1)
  const dx2 = 3 * (x3 - x2)
  const dy0 = 3 * (y1 - 0)
  const dy1 = 3 * (y2 - y1)
  const dy2 = 3 * (y3 - y2)
  const half = 1 / 2
  let sum = 0
  for (let node = 0; node < 20; node++) {
    const t = half * GAUSS_NODES[node] + half
    const speedX = bernstein2(t, dx0, dx1, dx2)
    const speedY = bernstein2(t, dy0, dy1, dy2)
    sum += GAUSS_WEIGHTS[node] * Math.sqrt(speedX * speedX + speedY * speedY)
  }
  return half * sum
}

/** The library's getDerivative at order 0 for three values: Σ binomial(2, k) · (1 − t)^(2−k) · t^k · value_k, summed from 0. */
function bernstein2(t: number, value0: number, value1: number, value2: number): number {
  let sum = 0
  sum += 1 * Math.pow(1 - t, 2) * Math.pow(t, 0) * value0
  sum += 2 * Math.pow(1 - t, 1) * Math.pow(t, 1) * value1
  sum += 1 * Math.pow(1 - t, 0) * Math.pow(t, 2) * value2
  return sum
}
