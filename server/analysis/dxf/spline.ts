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
  if (knots.some((knot, index) => index > 0 && knot < knots[index - 1])) return 'its knots are not in order'
  if (weights.length > 0 && (weights.length !== controlPoints.length || weights.some((weight) => !(weight > 0)))) return 'its weights are not one positive number per control point'
  if (!(knots[controlPoints.length] > knots[degree])) return 'its knots leave it no length'
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
  const first = evaluate(knots[degree], degree)
  path.moveTo(first.x, first.y)
  for (let span = degree; span < controlPoints.length; span++) {
    const from = knots[span]
    const to = knots[span + 1]
    if (!(to > from)) continue
    const atSpan = (t: number) => evaluate(t, span)
    addChords(atSpan, from, atSpan(from), to, atSpan(to), toleranceUnits, 0, path)
  }
}

function addChords(evaluate: (t: number) => Point2, t0: number, p0: Point2, t1: number, p1: Point2, toleranceUnits: number, depth: number, path: PathDataWriter): void {
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
      const point = controlPoints[span - degree + j]
      const weight = weights.length > 0 ? weights[span - degree + j] : 1
      xs[j] = point.x * weight
      ys[j] = point.y * weight
      ws[j] = weight
    }
    for (let level = 1; level <= degree; level++) {
      for (let j = degree; j >= level; j--) {
        const low = knots[span - degree + j]
        const high = knots[span + 1 + j - level]
        const alpha = high > low ? (t - low) / (high - low) : 0
        xs[j] = (1 - alpha) * xs[j - 1] + alpha * xs[j]
        ys[j] = (1 - alpha) * ys[j - 1] + alpha * ys[j]
        ws[j] = (1 - alpha) * ws[j - 1] + alpha * ws[j]
      }
    }
    return { x: xs[degree] / ws[degree], y: ys[degree] / ws[degree] }
  }
}

function distanceToChord(point: Point2, from: Point2, to: Point2): number {
  const chordX = to.x - from.x
  const chordY = to.y - from.y
  const chordLength = Math.hypot(chordX, chordY)
  if (chordLength === 0) return Math.hypot(point.x - from.x, point.y - from.y)
  return Math.abs(chordX * (point.y - from.y) - chordY * (point.x - from.x)) / chordLength
}
