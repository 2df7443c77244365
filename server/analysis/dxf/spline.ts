import type { PathDataWriter, Point2 } from './pathData'

export interface SplineDefinition {
  degree: number
  knots: number[]
  controlPoints: Point2[]
  /** One per control point; empty when the spline is not rational. */
  weights: number[]
}

// Each knot span is split at least into 2^MIN and at most into 2^MAX chords.
const MIN_SUBDIVISION_DEPTH = 2
const MAX_SUBDIVISION_DEPTH = 10

/** Why a SPLINE's numbers do not describe a B-spline, or undefined when they do. */
export function splineProblem({ degree, knots, controlPoints, weights }: SplineDefinition): string | undefined {
  if (!Number.isInteger(degree) || degree < 1 || degree > 25) return `its degree is ${degree}`
  if (controlPoints.length < degree + 1) return `it has ${controlPoints.length} control points for degree ${degree}`
  if (knots.length !== controlPoints.length + degree + 1) return `it has ${knots.length} knots for ${controlPoints.length} control points of degree ${degree}`
  if (knots.some((knot, index) => index > 0 && knot < knots[index - 1]!)) return 'its knots are not in order'
  if (weights.length > 0 && (weights.length !== controlPoints.length || weights.some((weight) => !(weight > 0)))) return 'its weights are not one positive number per control point'
  if (!(knots[controlPoints.length]! > knots[degree]!)) return 'its knots leave it no length'
  return undefined
}

/**
 * Draws a (rational) B-spline as chords: each knot span is halved until the
 * curve's midpoint between two chord ends lies within `toleranceUnits` of
 * the chord (after at least MIN_SUBDIVISION_DEPTH halvings, so an S-bend
 * within a span cannot hide between two samples). Points come from de Boor's
 * algorithm in homogeneous coordinates (Piegl & Tiller, The NURBS Book,
 * A2.1 and A4.1, from memory). The caller has checked `splineProblem`.
 */
export function drawSpline(spline: SplineDefinition, toleranceUnits: number, path: PathDataWriter): void {
  const { degree, knots, controlPoints } = spline
  const evaluate = splineEvaluator(spline)
  const first = evaluate(knots[degree]!, degree)
  path.moveTo(first.x, first.y)
  for (let span = degree; span < controlPoints.length; span++) {
    const from = knots[span]!
    const to = knots[span + 1]!
    if (!(to > from)) continue
    const atSpan = (t: number) => evaluate(t, span)
    addChords(atSpan, from, atSpan(from), to, atSpan(to), toleranceUnits, 0, path)
  }
}

function addChords(
  evaluate: (t: number) => Point2,
  t0: number,
  p0: Point2,
  t1: number,
  p1: Point2,
  toleranceUnits: number,
  depth: number,
  path: PathDataWriter,
): void {
  const middleT = (t0 + t1) / 2
  const middle = evaluate(middleT)
  if (depth < MAX_SUBDIVISION_DEPTH && (depth < MIN_SUBDIVISION_DEPTH || distanceToChord(middle, p0, p1) > toleranceUnits)) {
    addChords(evaluate, t0, p0, middleT, middle, toleranceUnits, depth + 1, path)
    addChords(evaluate, middleT, middle, t1, p1, toleranceUnits, depth + 1, path)
    return
  }
  path.lineTo(p1.x, p1.y)
}

/** Evaluates at parameter t in the given knot span [knots[span], knots[span + 1]]. */
function splineEvaluator({ degree, knots, controlPoints, weights }: SplineDefinition): (t: number, span: number) => Point2 {
  const xs = new Float64Array(degree + 1)
  const ys = new Float64Array(degree + 1)
  const ws = new Float64Array(degree + 1)
  return (t, span) => {
    for (let j = 0; j <= degree; j++) {
      const point = controlPoints[span - degree + j]!
      const weight = weights.length > 0 ? weights[span - degree + j]! : 1
      xs[j] = point.x * weight
      ys[j] = point.y * weight
      ws[j] = weight
    }
    for (let level = 1; level <= degree; level++) {
      for (let j = degree; j >= level; j--) {
        const low = knots[span - degree + j]!
        const high = knots[span + 1 + j - level]!
        const alpha = high > low ? (t - low) / (high - low) : 0
        xs[j] = (1 - alpha) * xs[j - 1]! + alpha * xs[j]!
        ys[j] = (1 - alpha) * ys[j - 1]! + alpha * ys[j]!
        ws[j] = (1 - alpha) * ws[j - 1]! + alpha * ws[j]!
      }
    }
    return { x: xs[degree]! / ws[degree]!, y: ys[degree]! / ws[degree]! }
  }
}

function distanceToChord(point: Point2, from: Point2, to: Point2): number {
  const chordX = to.x - from.x
  const chordY = to.y - from.y
  const chordLength = Math.hypot(chordX, chordY)
  if (chordLength === 0) return Math.hypot(point.x - from.x, point.y - from.y)
  return Math.abs(chordX * (point.y - from.y) - chordY * (point.x - from.x)) / chordLength
}

/** A SPLINE given by fit points only: the points, the optional start and end tangents (groups 12/22, 13/23) and whether it is closed (group 70 bit 1). */
export interface FitPointSpline {
  fitPoints: Point2[]
  startTangent?: Point2
  endTangent?: Point2
  closed: boolean
}

/**
 * A SPLINE given only by fit points passes through every one of them (DXF
 * reference, SPLINE: fit points, start and end tangents): drawn as the C²
 * cubic interpolating spline in chord-length parameters (de Boor, A Practical
 * Guide to Splines, ch. IV; Piegl & Tiller, The NURBS Book, §9.2), as cubic
 * Béziers, one per pair of neighbouring fit points. Each end takes its given
 * tangent (a direction; with chord-length parameters the curve's speed is
 * about 1, so the unit vector is the derivative) and is otherwise natural
 * (no curvature at the end); a closed spline is periodic. Fit tolerance
 * (group 44) is not applied: the curve runs through the points exactly.
 */
export function drawFitPointSpline({ fitPoints, startTangent, endTangent, closed }: FitPointSpline, path: PathDataWriter): void {
  const points = fitPoints.filter((point, index) => index === 0 || point.x !== fitPoints[index - 1]!.x || point.y !== fitPoints[index - 1]!.y)
  if (closed && points.length > 1 && points[0]!.x === points[points.length - 1]!.x && points[0]!.y === points[points.length - 1]!.y) points.pop()
  path.moveTo(points[0]!.x, points[0]!.y)
  if (points.length < 2) return
  const periodic = closed && points.length >= 3
  const count = points.length
  const segments = periodic ? count : count - 1
  const chord = new Float64Array(segments)
  for (let i = 0; i < segments; i++) {
    const next = points[(i + 1) % count]!
    chord[i] = Math.hypot(next.x - points[i]!.x, next.y - points[i]!.y)
  }
  const derivatives = periodic ? periodicDerivatives(points, chord) : clampedOrNaturalDerivatives(points, chord, unit(startTangent), unit(endTangent))
  for (let i = 0; i < segments; i++) {
    const j = (i + 1) % count
    const third = chord[i]! / 3
    path.cubicTo(
      { x: points[i]!.x + third * derivatives.x[i]!, y: points[i]!.y + third * derivatives.y[i]! },
      { x: points[j]!.x - third * derivatives.x[j]!, y: points[j]!.y - third * derivatives.y[j]! },
      points[j]!,
    )
  }
  if (closed) path.close()
}

function unit(vector: Point2 | undefined): Point2 | undefined {
  const length = vector ? Math.hypot(vector.x, vector.y) : 0
  return vector && length > 0 ? { x: vector.x / length, y: vector.y / length } : undefined
}

/**
 * The derivatives D at the fit points of an open spline: C² continuity gives, at each inner point,
 * h_i·D_{i−1} + 2(h_{i−1} + h_i)·D_i + h_{i−1}·D_{i+1} = 3(h_i·Δ_{i−1}/h_{i−1} + h_{i−1}·Δ_i/h_i), Δ_i = P_{i+1} − P_i;
 * an end is D = its tangent when given, else natural: 2D_0 + D_1 = 3Δ_0/h_0 and D_{n−1} + 2D_n = 3Δ_{n−1}/h_{n−1}.
 */
function clampedOrNaturalDerivatives(
  points: Point2[],
  h: Float64Array,
  start: Point2 | undefined,
  end: Point2 | undefined,
): { x: Float64Array; y: Float64Array } {
  const n = points.length
  const lower = new Float64Array(n)
  const diagonal = new Float64Array(n)
  const upper = new Float64Array(n)
  const rightX = new Float64Array(n)
  const rightY = new Float64Array(n)
  const deltaX = (i: number) => points[i + 1]!.x - points[i]!.x
  const deltaY = (i: number) => points[i + 1]!.y - points[i]!.y
  if (start) {
    diagonal[0] = 1
    rightX[0] = start.x
    rightY[0] = start.y
  } else {
    diagonal[0] = 2
    upper[0] = 1
    rightX[0] = (3 * deltaX(0)) / h[0]!
    rightY[0] = (3 * deltaY(0)) / h[0]!
  }
  for (let i = 1; i < n - 1; i++) {
    lower[i] = h[i]!
    diagonal[i] = 2 * (h[i - 1]! + h[i]!)
    upper[i] = h[i - 1]!
    rightX[i] = 3 * ((h[i]! * deltaX(i - 1)) / h[i - 1]! + (h[i - 1]! * deltaX(i)) / h[i]!)
    rightY[i] = 3 * ((h[i]! * deltaY(i - 1)) / h[i - 1]! + (h[i - 1]! * deltaY(i)) / h[i]!)
  }
  if (end) {
    diagonal[n - 1] = 1
    rightX[n - 1] = end.x
    rightY[n - 1] = end.y
  } else {
    lower[n - 1] = 1
    diagonal[n - 1] = 2
    rightX[n - 1] = (3 * deltaX(n - 2)) / h[n - 2]!
    rightY[n - 1] = (3 * deltaY(n - 2)) / h[n - 2]!
  }
  return { x: solveTridiagonal(lower, diagonal, upper, rightX), y: solveTridiagonal(lower, diagonal, upper, rightY) }
}

/** The same equations at every point of a closed spline, its neighbours taken round the loop (a cyclic system, by Sherman–Morrison). */
function periodicDerivatives(points: Point2[], h: Float64Array): { x: Float64Array; y: Float64Array } {
  const n = points.length
  const lower = new Float64Array(n)
  const diagonal = new Float64Array(n)
  const upper = new Float64Array(n)
  const rightX = new Float64Array(n)
  const rightY = new Float64Array(n)
  for (let i = 0; i < n; i++) {
    const before = (i + n - 1) % n
    const after = (i + 1) % n
    const hBefore = h[before]!
    lower[i] = h[i]!
    diagonal[i] = 2 * (hBefore + h[i]!)
    upper[i] = hBefore
    rightX[i] = 3 * ((h[i]! * (points[i]!.x - points[before]!.x)) / hBefore + (hBefore * (points[after]!.x - points[i]!.x)) / h[i]!)
    rightY[i] = 3 * ((h[i]! * (points[i]!.y - points[before]!.y)) / hBefore + (hBefore * (points[after]!.y - points[i]!.y)) / h[i]!)
  }
  return { x: solveCyclicTridiagonal(lower, diagonal, upper, rightX), y: solveCyclicTridiagonal(lower, diagonal, upper, rightY) }
}

/** Thomas's algorithm: row i is lower[i]·x[i−1] + diagonal[i]·x[i] + upper[i]·x[i+1] = right[i] (diagonally dominant here). */
function solveTridiagonal(lower: Float64Array, diagonal: Float64Array, upper: Float64Array, right: Float64Array): Float64Array {
  const n = diagonal.length
  const c = new Float64Array(n)
  const x = new Float64Array(n)
  let pivot = diagonal[0]!
  c[0] = upper[0]! / pivot
  x[0] = right[0]! / pivot
  for (let i = 1; i < n; i++) {
    pivot = diagonal[i]! - lower[i]! * c[i - 1]!
    c[i] = upper[i]! / pivot
    x[i] = (right[i]! - lower[i]! * x[i - 1]!) / pivot
  }
  for (let i = n - 2; i >= 0; i--) x[i]! -= c[i]! * x[i + 1]!
  return x
}

/** A tridiagonal system with corners lower[0] (row 0, column n−1) and upper[n−1] (row n−1, column 0): Numerical Recipes' cyclic method. */
function solveCyclicTridiagonal(lower: Float64Array, diagonal: Float64Array, upper: Float64Array, right: Float64Array): Float64Array {
  const n = diagonal.length
  const cornerTopRight = lower[0]!
  const cornerBottomLeft = upper[n - 1]!
  const gamma = -diagonal[0]!
  const modified = Float64Array.from(diagonal)
  modified[0] = diagonal[0]! - gamma
  modified[n - 1] = diagonal[n - 1]! - (cornerBottomLeft * cornerTopRight) / gamma
  const innerLower = Float64Array.from(lower)
  const innerUpper = Float64Array.from(upper)
  innerLower[0] = 0
  innerUpper[n - 1] = 0
  const x = solveTridiagonal(innerLower, modified, innerUpper, right)
  const u = new Float64Array(n)
  u[0] = gamma
  u[n - 1] = cornerBottomLeft
  const z = solveTridiagonal(innerLower, modified, innerUpper, u)
  const factor = (x[0]! + (cornerTopRight * x[n - 1]!) / gamma) / (1 + z[0]! + (cornerTopRight * z[n - 1]!) / gamma)
  for (let i = 0; i < n; i++) x[i]! -= factor * z[i]!
  return x
}
