import svgpath from 'svgpath'
import arcToCubics from 'svgpath/lib/a2c.js'
import { curveLengthMm } from './curveLength'
import { AnalysisInputError } from './errors'
import type { Matrix } from './matrix'
import type { PolylineSet } from './polylines'
import { CURVE_ARC, CURVE_CUBIC, CURVE_STRIDE, curveNumberCount, PathSteps, STEP_CLOSE, STEP_CURVE, STEP_MOVE } from './pathSteps'

// Beyond a kilometre a coordinate is a drawing mistake (or 1e300), and sums of squares would overflow.
const MAX_COORDINATE_MM = 1e6
// A single curve never needs more chords than this, whatever its size.
const MAX_CHORDS_PER_CURVE = 4096

interface SvgPathWithState {
  err: string
  segments: Array<[string, ...number[]]>
}

/**
 * Flattens path data, transformed into mm, into `target`: one polyline per
 * subpath, with chords no farther than `chordToleranceMm` from the curve and
 * the exact length of the transformed curves (`curveLength.ts`; svgpath
 * transforms arcs exactly, including skew). Path data that PathSteps reads
 * skips svgpath: straight steps go through the matrix as svgpath's
 * Matrix.calc would take them, and curves are used as read when the matrix is
 * the identity (svgpath leaves them alone then), or go through the matrix as
 * svgpath's matrix() takes them when every number of the path is absolute
 * (`transformedCurve`). One flattener serves one analysis.
 */
export class PathFlattener {
  private readonly steps = new PathSteps()

  constructor(
    private readonly target: PolylineSet,
    private readonly chordToleranceMm: number,
  ) {}

  flatten(pathData: string, matrix: Matrix, operationCode: number, elementIndex: number, forceClosed: boolean): void {
    const subpaths = new SubpathWriter(this.target, operationCode, elementIndex, forceClosed)
    const [a, b, c, d, e, f] = matrix
    // svgpath's own identity test: under it no arithmetic may touch the numbers.
    const identity = a === 1 && b === 0 && c === 0 && d === 1 && e === 0 && f === 0
    const { steps } = this
    if (steps.read(pathData) && (identity || steps.curveCount === 0 || !steps.hasRelative)) {
      flattenSteps(steps, matrix, identity, this.chordToleranceMm, subpaths)
    } else {
      flattenWithSvgpath(pathData, matrix, this.chordToleranceMm, subpaths)
    }
    subpaths.finish(false)
  }
}

function flattenSteps(steps: PathSteps, matrix: Matrix, identity: boolean, chordToleranceMm: number, subpaths: SubpathWriter): void {
  const [a, b, c, d, e, f] = matrix
  let curve = 0
  // The current point before the matrix, as svgpath's iterate() tracks it.
  let userX = 0
  let userY = 0
  for (let step = 0; step < steps.count; step++) {
    const kind = steps.kind[step]
    if (kind === STEP_CURVE) {
      const command = steps.curveCommand[curve]!
      const offset = curve * CURVE_STRIDE
      if (identity) flattenCurve(command, steps.curveNumbers, offset, chordToleranceMm, subpaths)
      else transformedCurve(command, steps.curveNumbers, offset, matrix, userX, userY, chordToleranceMm, subpaths)
      const end = offset + curveNumberCount(command) - 2
      userX = steps.curveNumbers[end]!
      userY = steps.curveNumbers[end + 1]!
      curve++
      continue
    }
    userX = steps.x[step]!
    userY = steps.y[step]!
    if (kind === STEP_CLOSE) {
      subpaths.finish(true)
      continue
    }
    // svgpath's Matrix.calc, term for term.
    const x = identity ? userX : userX * a + userY * c + e
    const y = identity ? userY : userX * b + userY * d + f
    if (kind === STEP_MOVE) subpaths.moveTo(x, y)
    else subpaths.lineTo(x, y)
  }
}

/**
 * An absolute C, Q or A segment through the matrix as svgpath's matrix()
 * transforms it, term for term: control and end points by Matrix.calc; an
 * arc's radii and rotation by its Ellipse.transform, the sweep flag turned
 * over by a mirroring matrix, and a line instead of an arc that ends where it
 * starts (before the matrix) or whose ellipse is degenerate.
 */
function transformedCurve(
  command: number,
  numbers: Float64Array,
  offset: number,
  matrix: Matrix,
  fromUserX: number,
  fromUserY: number,
  chordToleranceMm: number,
  subpaths: SubpathWriter,
): void {
  const [a, b, c, d, e, f] = matrix
  const transformed = new Float64Array(CURVE_STRIDE)
  if (command !== CURVE_ARC) {
    for (let position = 0; position < curveNumberCount(command); position += 2) {
      const x = numbers[offset + position]!
      const y = numbers[offset + position + 1]!
      transformed[position] = x * a + y * c + e
      transformed[position + 1] = x * b + y * d + f
    }
    flattenCurve(command, transformed, 0, chordToleranceMm, subpaths)
    return
  }
  const ellipse = transformedEllipse(numbers[offset]!, numbers[offset + 1]!, numbers[offset + 2]!, matrix)
  const sweep = numbers[offset + 4]!
  const x = numbers[offset + 5]!
  const y = numbers[offset + 6]!
  const toX = x * a + y * c + e
  const toY = x * b + y * d + f
  if ((x === fromUserX && y === fromUserY) || ellipse.rx < ELLIPSE_EPSILON * ellipse.ry || ellipse.ry < ELLIPSE_EPSILON * ellipse.rx) {
    subpaths.lineTo(toX, toY)
    return
  }
  transformed[0] = ellipse.rx
  transformed[1] = ellipse.ry
  transformed[2] = ellipse.ax
  transformed[3] = numbers[offset + 3]!
  transformed[4] = a * d - b * c < 0 ? (sweep ? 0 : 1) : sweep
  transformed[5] = toX
  transformed[6] = toY
  flattenCurve(CURVE_ARC, transformed, 0, chordToleranceMm, subpaths)
}

// svgpath 2.6's ellipse.js: its tolerance, and degrees to radians as it computes them.
const ELLIPSE_EPSILON = 0.0000000001
const DEGREES_TO_RADIANS = Math.PI / 180

/** svgpath's Ellipse(rx, ry, ax).transform(matrix), term for term: the radii and rotation (degrees) of the transformed ellipse. */
function transformedEllipse(rxGiven: number, ryGiven: number, axGiven: number, m: Matrix): { rx: number; ry: number; ax: number } {
  const c = Math.cos(axGiven * DEGREES_TO_RADIANS)
  const s = Math.sin(axGiven * DEGREES_TO_RADIANS)
  const ma0 = rxGiven * (m[0] * c + m[2] * s)
  const ma1 = rxGiven * (m[1] * c + m[3] * s)
  const ma2 = ryGiven * (-m[0] * s + m[2] * c)
  const ma3 = ryGiven * (-m[1] * s + m[3] * c)
  const J = ma0 * ma0 + ma2 * ma2
  const K = ma1 * ma1 + ma3 * ma3
  let D = ((ma0 - ma3) * (ma0 - ma3) + (ma2 + ma1) * (ma2 + ma1)) * ((ma0 + ma3) * (ma0 + ma3) + (ma2 - ma1) * (ma2 - ma1))
  const JK = (J + K) / 2
  if (D < ELLIPSE_EPSILON * JK) {
    const radius = Math.sqrt(JK)
    return { rx: radius, ry: radius, ax: 0 }
  }
  const L = ma0 * ma1 + ma2 * ma3
  D = Math.sqrt(D)
  const l1 = JK + D / 2
  const l2 = JK - D / 2
  let ax =
    Math.abs(L) < ELLIPSE_EPSILON && Math.abs(l1 - K) < ELLIPSE_EPSILON
      ? 90
      : (Math.atan(Math.abs(L) > Math.abs(l1 - K) ? (l1 - J) / L : L / (l1 - K)) * 180) / Math.PI
  if (ax >= 0) return { rx: Math.sqrt(l1), ry: Math.sqrt(l2), ax }
  ax += 90
  return { rx: Math.sqrt(l2), ry: Math.sqrt(l1), ax }
}

function flattenWithSvgpath(pathData: string, matrix: Matrix, chordToleranceMm: number, subpaths: SubpathWriter): void {
  const path = svgpath(pathData).matrix([...matrix]).abs().unshort() as unknown as SvgPathWithState
  if (path.err) {
    throw new AnalysisInputError('badNumber', `A shape's path data cannot be read (${path.err.replace(/^SvgPath: /, '')}). Save the file again from your drawing program.`)
  }
  const curve = new Float64Array(CURVE_STRIDE)
  for (const segment of path.segments) {
    const command = segment[0]
    switch (command) {
      case 'M':
        subpaths.moveTo(segment[1] as number, segment[2] as number)
        break
      case 'Z':
        subpaths.finish(true)
        break
      case 'L':
      case 'H':
      case 'V':
        subpaths.lineTo(command === 'V' ? subpaths.x : (segment[1] as number), command === 'H' ? subpaths.y : command === 'V' ? (segment[1] as number) : (segment[2] as number))
        break
      case 'C':
      case 'Q':
      case 'A':
        // svgpath writes the flags of an arc it has mirrored as the strings "0"/"1": Number() reads both forms.
        for (let position = 1; position < segment.length; position++) curve[position - 1] = Number(segment[position])
        flattenCurve(command.charCodeAt(0), curve, 0, chordToleranceMm, subpaths)
        break
    }
  }
}

/** One absolute C, Q or A segment (its numbers at numbers[offset …]) from the current point: its chords, and its exact length. */
function flattenCurve(command: number, numbers: Float64Array, offset: number, chordToleranceMm: number, subpaths: SubpathWriter): void {
  const { target } = subpaths
  subpaths.ensureOpen()
  const { x, y } = subpaths
  if (command !== CURVE_ARC) {
    const isCubic = command === CURVE_CUBIC
    if (isCubic) {
      addCubic(target, x, y, numbers[offset]!, numbers[offset + 1]!, numbers[offset + 2]!, numbers[offset + 3]!,
        numbers[offset + 4]!, numbers[offset + 5]!, chordToleranceMm)
    } else {
      addQuadratic(target, x, y, numbers[offset]!, numbers[offset + 1]!, numbers[offset + 2]!, numbers[offset + 3]!, chordToleranceMm)
    }
    const end = offset + (isCubic ? 4 : 2)
    subpaths.curveTo(numbers[end]!, numbers[end + 1]!, curveLengthMm(x, y, command, numbers, offset))
    return
  }
  const rx = numbers[offset]!
  const ry = numbers[offset + 1]!
  const rotationDeg = numbers[offset + 2]!
  const largeArc = numbers[offset + 3]!
  const sweep = numbers[offset + 4]!
  const toX = numbers[offset + 5]!
  const toY = numbers[offset + 6]!
  if (toX === x && toY === y) return
  // SVG 1.1 F.6.2: an arc with a zero radius is a straight line.
  if (rx === 0 || ry === 0) {
    subpaths.lineTo(toX, toY)
    return
  }
  for (const cubic of arcToCubics(x, y, toX, toY, largeArc, sweep, rx, ry, rotationDeg)) {
    addCubic(target, cubic[0]!, cubic[1]!, cubic[2]!, cubic[3]!, cubic[4]!, cubic[5]!, cubic[6]!, cubic[7]!, chordToleranceMm)
  }
  // The cubics end on the arc's endpoint up to rounding; land exactly on it.
  target.xy[2 * target.pointCount - 2] = toX
  target.xy[2 * target.pointCount - 1] = toY
  subpaths.curveTo(toX, toY, curveLengthMm(x, y, command, numbers, offset))
}

/**
 * Turns moves, lines and closes into polylines of `target`: a polyline
 * begins at the first drawing command after a move, and a close (or a filled
 * shape's implicit close) draws back to the subpath's start.
 */
class SubpathWriter {
  x = 0
  y = 0
  private startX = 0
  private startY = 0
  private open = false
  private lengthMm = 0

  constructor(
    readonly target: PolylineSet,
    private readonly operationCode: number,
    private readonly elementIndex: number,
    private readonly forceClosed: boolean,
  ) {}

  moveTo(x: number, y: number): void {
    this.finish(false)
    this.x = this.startX = x
    this.y = this.startY = y
  }

  lineTo(toX: number, toY: number): void {
    this.ensureOpen()
    this.lengthMm += Math.hypot(toX - this.x, toY - this.y)
    addPoint(this.target, toX, toY)
    this.x = toX
    this.y = toY
  }

  /** After the curve's chords were added: moves the current point and counts the curve's own length. */
  curveTo(toX: number, toY: number, curveLengthMm: number): void {
    this.lengthMm += curveLengthMm
    this.x = toX
    this.y = toY
  }

  ensureOpen(): void {
    if (this.open) return
    this.target.begin(this.operationCode, this.elementIndex)
    addPoint(this.target, this.x, this.y)
    this.open = true
    this.lengthMm = 0
  }

  finish(closedByCommand: boolean): void {
    if (!this.open) return
    const closed = closedByCommand || this.forceClosed
    if (closed && (this.x !== this.startX || this.y !== this.startY)) {
      this.lengthMm += Math.hypot(this.startX - this.x, this.startY - this.y)
      addPoint(this.target, this.startX, this.startY)
    }
    this.target.end(closed, this.lengthMm)
    this.open = false
    this.x = this.startX
    this.y = this.startY
  }
}

function addPoint(target: PolylineSet, x: number, y: number): void {
  // Written so that NaN fails the test too.
  if (!(Math.abs(x) <= MAX_COORDINATE_MM && Math.abs(y) <= MAX_COORDINATE_MM)) {
    throw new AnalysisInputError('outOfRange', 'The drawing has coordinates that are not numbers or lie more than a kilometre away. Check the document size and scale in your drawing program.')
  }
  target.addPoint(x, y)
}

// Wang's formula for uniform subdivision: the chord error of a degree-n
// Bézier split into k pieces is at most n(n−1)/8 · max|Δ²P| / k².
function chordCount(secondDifference: number, degree: number, toleranceMm: number): number {
  const count = Math.ceil(Math.sqrt((degree * (degree - 1) * secondDifference) / (8 * toleranceMm)))
  return Math.min(MAX_CHORDS_PER_CURVE, Math.max(1, count))
}

/** Adds the chords after (x0, y0). */
function addCubic(
  target: PolylineSet,
  x0: number,
  y0: number,
  x1: number,
  y1: number,
  x2: number,
  y2: number,
  x3: number,
  y3: number,
  toleranceMm: number,
): void {
  const secondDifference = Math.max(Math.hypot(x0 - 2 * x1 + x2, y0 - 2 * y1 + y2), Math.hypot(x1 - 2 * x2 + x3, y1 - 2 * y2 + y3))
  const chords = chordCount(secondDifference, 3, toleranceMm)
  for (let step = 1; step <= chords; step++) {
    const t = step / chords
    const u = 1 - t
    const b0 = u * u * u
    const b1 = 3 * u * u * t
    const b2 = 3 * u * t * t
    const b3 = t * t * t
    addPoint(target, b0 * x0 + b1 * x1 + b2 * x2 + b3 * x3, b0 * y0 + b1 * y1 + b2 * y2 + b3 * y3)
  }
}

function addQuadratic(target: PolylineSet, x0: number, y0: number, x1: number, y1: number, x2: number, y2: number, toleranceMm: number): void {
  const chords = chordCount(Math.hypot(x0 - 2 * x1 + x2, y0 - 2 * y1 + y2), 2, toleranceMm)
  for (let step = 1; step <= chords; step++) {
    const t = step / chords
    const u = 1 - t
    addPoint(target, u * u * x0 + 2 * u * t * x1 + t * t * x2, u * u * y0 + 2 * u * t * y1 + t * t * y2)
  }
}
