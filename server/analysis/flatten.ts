import svgpath from 'svgpath'
import arcToCubics from 'svgpath/lib/a2c.js'
import { svgPathProperties } from 'svg-path-properties'
import { AnalysisInputError } from './errors'
import type { Matrix } from './matrix'
import type { PolylineSet } from './polylines'

// Beyond a kilometre a coordinate is a drawing mistake (or 1e300), and sums of squares would overflow.
const MAX_COORDINATE_MM = 1e6
// A single curve never needs more chords than this, whatever its size.
const MAX_CHORDS_PER_CURVE = 4096

interface SvgPathWithState {
  err: string
  segments: Array<[string, ...number[]]>
}

/**
 * Flattens one element's path data, transformed into mm, into `target`:
 * one polyline per subpath, with chords no farther than `chordToleranceMm`
 * from the curve and the exact length of the transformed curves (svgpath
 * transforms arcs exactly, including skew; svg-path-properties measures them).
 */
export function flattenPath(pathData: string, matrix: Matrix, chordToleranceMm: number, target: PolylineSet, operationCode: number, elementIndex: number, forceClosed: boolean): void {
  const path = svgpath(pathData).matrix([...matrix]).abs().unshort() as unknown as SvgPathWithState
  if (path.err) {
    throw new AnalysisInputError('badNumber', `A shape's path data cannot be read (${path.err.replace(/^SvgPath: /, '')}). Save the file again from your drawing program.`)
  }
  let startX = 0
  let startY = 0
  let x = 0
  let y = 0
  let open = false
  let lengthMm = 0
  const finish = (closedByCommand: boolean) => {
    if (!open) return
    if ((closedByCommand || forceClosed) && (x !== startX || y !== startY)) {
      lengthMm += Math.hypot(startX - x, startY - y)
      addPoint(target, startX, startY)
    }
    target.end(closedByCommand || forceClosed, lengthMm)
    open = false
    x = startX
    y = startY
  }
  const ensureOpen = () => {
    if (open) return
    target.begin(operationCode, elementIndex)
    addPoint(target, x, y)
    open = true
    lengthMm = 0
  }
  for (const segment of path.segments) {
    const command = segment[0]
    switch (command) {
      case 'M':
        finish(false)
        x = startX = segment[1] as number
        y = startY = segment[2] as number
        break
      case 'Z':
        finish(true)
        break
      case 'L':
      case 'H':
      case 'V': {
        ensureOpen()
        const toX = command === 'V' ? x : (segment[1] as number)
        const toY = command === 'H' ? y : command === 'V' ? (segment[1] as number) : (segment[2] as number)
        lengthMm += Math.hypot(toX - x, toY - y)
        addPoint(target, toX, toY)
        x = toX
        y = toY
        break
      }
      case 'C':
      case 'Q': {
        ensureOpen()
        const [, ...numbers] = segment as [string, ...number[]]
        const chordsMm = command === 'C'
          ? addCubic(target, x, y, numbers[0], numbers[1], numbers[2], numbers[3], numbers[4], numbers[5], chordToleranceMm)
          : addQuadratic(target, x, y, numbers[0], numbers[1], numbers[2], numbers[3], chordToleranceMm)
        lengthMm += curveLength(x, y, segment, chordsMm)
        x = numbers[numbers.length - 2]
        y = numbers[numbers.length - 1]
        break
      }
      case 'A': {
        ensureOpen()
        const [, rx, ry, rotationDeg, largeArc, sweep, toX, toY] = segment as number[]
        if (toX === x && toY === y) break
        // SVG 1.1 F.6.2: an arc with a zero radius is a straight line.
        if (rx === 0 || ry === 0) {
          lengthMm += Math.hypot(toX - x, toY - y)
          addPoint(target, toX, toY)
        } else {
          // The cubics approximating an arc bulge slightly outside it, so their chords are no lower bound here.
          lengthMm += curveLength(x, y, segment, 0)
          for (const cubic of arcToCubics(x, y, toX, toY, largeArc, sweep, rx, ry, rotationDeg)) {
            addCubic(target, cubic[0], cubic[1], cubic[2], cubic[3], cubic[4], cubic[5], cubic[6], cubic[7], chordToleranceMm)
          }
          // The cubics end on the arc's endpoint up to rounding; land exactly on it.
          target.xy[2 * target.pointCount - 2] = toX
          target.xy[2 * target.pointCount - 1] = toY
        }
        x = toX
        y = toY
        break
      }
    }
  }
  finish(false)
}

/**
 * svg-path-properties' quadrature, bounded below by inscribed chords when
 * given: by the triangle inequality no curve is shorter than its chords, and
 * quadrature undershoots near cusps.
 */
function curveLength(fromX: number, fromY: number, segment: [string, ...number[]], chordsMm: number): number {
  return Math.max(chordsMm, new svgPathProperties(`M${fromX} ${fromY}${segment.join(' ')}`).getTotalLength())
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

/** Adds the chords after (x0, y0) and returns their total length. */
function addCubic(target: PolylineSet, x0: number, y0: number, x1: number, y1: number, x2: number, y2: number, x3: number, y3: number, toleranceMm: number): number {
  const secondDifference = Math.max(Math.hypot(x0 - 2 * x1 + x2, y0 - 2 * y1 + y2), Math.hypot(x1 - 2 * x2 + x3, y1 - 2 * y2 + y3))
  const chords = chordCount(secondDifference, 3, toleranceMm)
  let chordsMm = 0
  for (let step = 1; step <= chords; step++) {
    const t = step / chords
    const u = 1 - t
    const b0 = u * u * u
    const b1 = 3 * u * u * t
    const b2 = 3 * u * t * t
    const b3 = t * t * t
    chordsMm += addChordTo(target, b0 * x0 + b1 * x1 + b2 * x2 + b3 * x3, b0 * y0 + b1 * y1 + b2 * y2 + b3 * y3)
  }
  return chordsMm
}

function addQuadratic(target: PolylineSet, x0: number, y0: number, x1: number, y1: number, x2: number, y2: number, toleranceMm: number): number {
  const chords = chordCount(Math.hypot(x0 - 2 * x1 + x2, y0 - 2 * y1 + y2), 2, toleranceMm)
  let chordsMm = 0
  for (let step = 1; step <= chords; step++) {
    const t = step / chords
    const u = 1 - t
    chordsMm += addChordTo(target, u * u * x0 + 2 * u * t * x1 + t * t * x2, u * u * y0 + 2 * u * t * y1 + t * t * y2)
  }
  return chordsMm
}

function addChordTo(target: PolylineSet, x: number, y: number): number {
  const lengthMm = Math.hypot(x - target.xy[2 * target.pointCount - 2], y - target.xy[2 * target.pointCount - 1])
  addPoint(target, x, y)
  return lengthMm
}
