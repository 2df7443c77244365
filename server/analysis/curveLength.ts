// Exact lengths of the curves of path data: circular arcs in closed form, Bézier curves and elliptical arcs by
// adaptive Gauss–Kronrod quadrature of their speed, split where the speed has a corner or a minimum.
import { CURVE_ARC, CURVE_CUBIC } from './pathSteps'

// Gauss–Kronrod 7/15 rule on [−1, 1] (QUADPACK's qk15: Piessens, de Doncker-Kapenga, Überhuber, Kahaner 1983):
// the positive Kronrod nodes, largest first, and their weights; the Gauss nodes are every other one, from the
// second, and the centre. The Gauss rule is exact for polynomials up to degree 13, the Kronrod rule up to 23.
// Each literal is the shortest that reads back as the double nearest qk15's 18-digit value.
const KRONROD_NODES = [
  0.9914553711208126, 0.9491079123427585, 0.8648644233597691, 0.7415311855993945, 0.5860872354676911, 0.4058451513773972, 0.20778495500789848,
]
const KRONROD_WEIGHTS = [
  0.022935322010529224, 0.06309209262997856, 0.10479001032225019, 0.14065325971552592, 0.1690047266392679, 0.19035057806478542, 0.20443294007529889,
]
const KRONROD_CENTRE_WEIGHT = 0.20948214108472782
const GAUSS_WEIGHTS = [0.1294849661688697, 0.27970539148927664, 0.3818300505051189]
const GAUSS_CENTRE_WEIGHT = 0.4179591836734694

// A curve's length is wanted to a nanometre (far below what any cutter resolves), or to 1e-12 of its size for
// curves so large that a nanometre is below the rounding of their coordinates.
const TOLERANCE_MM = 1e-9
const RELATIVE_TOLERANCE = 1e-12
// Each halving halves the interval's share of the tolerance; this deep the interval is 2⁻³⁰ of the curve.
const MAX_DEPTH = 30

/**
 * ∫ speed over [from, to], adaptively: an interval is accepted when its
 * 7-point Gauss and 15-point Kronrod estimates agree within its share of the
 * tolerance (the difference bounds the Gauss rule's error, and the Kronrod
 * rule is far more accurate still), otherwise it is halved.
 */
function integrate(speed: (t: number) => number, from: number, to: number, toleranceMm: number, depth: number): number {
  const halfWidth = (to - from) / 2
  const centre = from + halfWidth
  const centreSpeed = speed(centre)
  let kronrod = KRONROD_CENTRE_WEIGHT * centreSpeed
  let gauss = GAUSS_CENTRE_WEIGHT * centreSpeed
  for (let node = 0; node < KRONROD_NODES.length; node++) {
    const offset = halfWidth * KRONROD_NODES[node]!
    const pair = speed(centre - offset) + speed(centre + offset)
    kronrod += KRONROD_WEIGHTS[node]! * pair
    if (node % 2 === 1) gauss += GAUSS_WEIGHTS[node >> 1]! * pair
  }
  kronrod *= halfWidth
  gauss *= halfWidth
  // Written so that a NaN is accepted rather than halved for ever.
  if (!(Math.abs(kronrod - gauss) > toleranceMm) || depth === MAX_DEPTH) return kronrod
  return integrate(speed, from, centre, toleranceMm / 2, depth + 1) + integrate(speed, centre, to, toleranceMm / 2, depth + 1)
}

/**
 * The length of the cubic Bézier curve P0 P1 P2 P3: ∫₀¹ |B′(t)| dt. The speed
 * |B′| is smooth except where B′ = 0 (a cusp), where it has a corner that
 * quadrature over it would miss; both cusps and near-cusps are minima of the
 * speed, so [0, 1] is split at every root of d|B′|²/dt = 2 B′·B″ first.
 * The answer lies between the chord and the control polygon's length (the
 * convex hull property), and is kept there.
 */
export function cubicLengthMm(x0: number, y0: number, x1: number, y1: number, x2: number, y2: number, x3: number, y3: number): number {
  // B′(t) = a·t² + b·t + c (the Bernstein form 3[(1−t)²(P1−P0) + 2(1−t)t(P2−P1) + t²(P3−P2)] expanded).
  const cx = 3 * (x1 - x0)
  const cy = 3 * (y1 - y0)
  const bx = 6 * (x2 - 2 * x1 + x0)
  const by = 6 * (y2 - 2 * y1 + y0)
  const ax = 3 * (x3 - 3 * x2 + 3 * x1 - x0)
  const ay = 3 * (y3 - 3 * y2 + 3 * y1 - y0)
  const speed = (t: number) => {
    const dx = (ax * t + bx) * t + cx
    const dy = (ay * t + by) * t + cy
    return Math.sqrt(dx * dx + dy * dy)
  }
  const chordMm = Math.hypot(x3 - x0, y3 - y0)
  const polygonMm = Math.hypot(x1 - x0, y1 - y0) + Math.hypot(x2 - x1, y2 - y1) + Math.hypot(x3 - x2, y3 - y2)
  if (polygonMm === 0) return 0
  const toleranceMm = Math.max(TOLERANCE_MM, RELATIVE_TOLERANCE * polygonMm)
  // B′·B″ with B″(t) = 2a·t + b: a cubic in t.
  const splits = rootsInUnitInterval(2 * (ax * ax + ay * ay), 3 * (ax * bx + ay * by), bx * bx + by * by + 2 * (ax * cx + ay * cy), bx * cx + by * cy)
  let lengthMm = 0
  let from = 0
  for (const to of [...splits, 1]) {
    if (to > from) lengthMm += integrate(speed, from, to, toleranceMm * (to - from), 0)
    from = to
  }
  return Math.min(polygonMm, Math.max(chordMm, lengthMm))
}

/** The quadratic Bézier P0 P1 P2, measured as the cubic it is (degree elevation: the same curve). */
export function quadraticLengthMm(x0: number, y0: number, x1: number, y1: number, x2: number, y2: number): number {
  return cubicLengthMm(x0, y0, x0 + (2 / 3) * (x1 - x0), y0 + (2 / 3) * (y1 - y0), x2 + (2 / 3) * (x1 - x2), y2 + (2 / 3) * (y1 - y2), x2, y2)
}

/**
 * The length of an SVG elliptical arc from (x0, y0): its centre and angles
 * from the endpoint form (SVG 1.1 F.6.5, radii scaled up when too small,
 * F.6.6), then r·Δθ for a circle and ∫ √(rx²sin²θ + ry²cos²θ) dθ over the
 * swept angle for an ellipse (the speed is unchanged by the rotation).
 * A zero radius is a straight line (F.6.2); an arc that ends where it starts
 * is not drawn (F.6.2).
 */
export function arcLengthMm(
  x0: number,
  y0: number,
  rxGiven: number,
  ryGiven: number,
  rotationDeg: number,
  largeArc: boolean,
  sweep: boolean,
  x: number,
  y: number,
): number {
  if (x === x0 && y === y0) return 0
  let rx = Math.abs(rxGiven)
  let ry = Math.abs(ryGiven)
  if (rx === 0 || ry === 0) return Math.hypot(x - x0, y - y0)
  const rotationRad = (rotationDeg * Math.PI) / 180
  const cos = Math.cos(rotationRad)
  const sin = Math.sin(rotationRad)
  // F.6.5.1: the midpoint of the chord in the ellipse's own axes.
  const halfX = (x0 - x) / 2
  const halfY = (y0 - y) / 2
  const primeX = cos * halfX + sin * halfY
  const primeY = -sin * halfX + cos * halfY
  // F.6.6.2–3: radii too small for the chord grow in proportion until the arc is a half ellipse.
  const excess = (primeX * primeX) / (rx * rx) + (primeY * primeY) / (ry * ry)
  if (excess > 1) {
    rx *= Math.sqrt(excess)
    ry *= Math.sqrt(excess)
  }
  // F.6.5.2: the centre in the ellipse's axes (the root of a rounding error below zero is 0).
  const numerator = rx * rx * ry * ry - rx * rx * primeY * primeY - ry * ry * primeX * primeX
  const denominator = rx * rx * primeY * primeY + ry * ry * primeX * primeX
  const factor = (largeArc !== sweep ? 1 : -1) * Math.sqrt(Math.max(0, numerator / denominator))
  const centreX = (factor * rx * primeY) / ry
  const centreY = (-factor * ry * primeX) / rx
  // F.6.5.5–6: the start angle and the swept angle, positive when the sweep flag is set.
  const startUx = (primeX - centreX) / rx
  const startUy = (primeY - centreY) / ry
  const endUx = (-primeX - centreX) / rx
  const endUy = (-primeY - centreY) / ry
  const startAngle = Math.atan2(startUy, startUx)
  let sweptAngle = Math.atan2(startUx * endUy - startUy * endUx, startUx * endUx + startUy * endUy)
  if (!sweep && sweptAngle > 0) sweptAngle -= 2 * Math.PI
  else if (sweep && sweptAngle < 0) sweptAngle += 2 * Math.PI
  if (rx === ry) return rx * Math.abs(sweptAngle)
  const speed = (angle: number) => Math.sqrt(rx * rx * Math.sin(angle) ** 2 + ry * ry * Math.cos(angle) ** 2)
  const from = Math.min(startAngle, startAngle + sweptAngle)
  const to = Math.max(startAngle, startAngle + sweptAngle)
  const toleranceMm = Math.max(TOLERANCE_MM, RELATIVE_TOLERANCE * Math.max(rx, ry))
  // The speed is smooth everywhere; splitting at its extremes (multiples of a quarter turn) leaves monotone pieces.
  let lengthMm = 0
  let pieceFrom = from
  for (let quarter = Math.floor(from / (Math.PI / 2)) + 1; pieceFrom < to; quarter++) {
    const pieceTo = Math.min(to, (quarter * Math.PI) / 2)
    lengthMm += integrate(speed, pieceFrom, pieceTo, (toleranceMm * (pieceTo - pieceFrom)) / (to - from), 0)
    pieceFrom = pieceTo
  }
  return lengthMm
}

/** The length of one absolute C, Q or A segment from (fromX, fromY), its numbers at numbers[offset …] in path-data order. */
export function curveLengthMm(fromX: number, fromY: number, command: number, numbers: ArrayLike<number>, offset: number): number {
  const n = (position: number) => numbers[offset + position]!
  if (command === CURVE_CUBIC) return cubicLengthMm(fromX, fromY, n(0), n(1), n(2), n(3), n(4), n(5))
  if (command === CURVE_ARC) return arcLengthMm(fromX, fromY, n(0), n(1), n(2), n(3) !== 0, n(4) !== 0, n(5), n(6))
  return quadraticLengthMm(fromX, fromY, n(0), n(1), n(2), n(3))
}

/**
 * The roots in (0, 1) of p·t³ + q·t² + r·t + s, ascending: the cubic is
 * monotone between the roots of its derivative, and each monotone stretch
 * whose ends differ in sign holds one root, found by bisection to the last bit.
 */
function rootsInUnitInterval(p: number, q: number, r: number, s: number): number[] {
  const value = (t: number) => ((p * t + q) * t + r) * t + s
  const stretchEnds = [0, ...quadraticRoots(3 * p, 2 * q, r).filter((t) => t > 0 && t < 1), 1]
  const roots: number[] = []
  for (let stretch = 0; stretch + 1 < stretchEnds.length; stretch++) {
    let low = stretchEnds[stretch]!
    let high = stretchEnds[stretch + 1]!
    const lowValue = value(low)
    if (stretch > 0 && lowValue === 0) roots.push(low)
    if (!(lowValue * value(high) < 0)) continue
    for (let middle = (low + high) / 2; middle > low && middle < high; middle = (low + high) / 2) {
      if (value(middle) * lowValue > 0) low = middle
      else high = middle
    }
    roots.push(high)
  }
  return roots
}

/** The real roots of a·t² + b·t + c (a linear or constant equation when a is 0), by the cancellation-free form. */
function quadraticRoots(a: number, b: number, c: number): number[] {
  if (a === 0) return b === 0 ? [] : [-c / b]
  const discriminant = b * b - 4 * a * c
  if (discriminant < 0) return []
  const q = -(b + Math.sign(b || 1) * Math.sqrt(discriminant)) / 2
  const roots = [q / a]
  if (q !== 0) roots.push(c / q)
  return roots.sort((first, second) => first - second)
}
