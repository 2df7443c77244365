import { svgPathProperties } from 'svg-path-properties'
import { arcLengthFromOrigin, cubicLengthFromOrigin } from './curveLengthPort'
import { CURVE_ARC, CURVE_CUBIC, curveNumberCount } from './pathSteps'

// Drawings repeat the same holes, reliefs and rounded corners thousands of
// times; past this many distinct curves in one analysis the memory starts afresh.
const MAX_REMEMBERED_CURVES = 50_000
// A curve is measured moved to the origin with its numbers rounded to a
// nanometre, so its length depends only on its shape and copies of a shape
// share one measurement wherever they are (the rounding changes a length by
// far less than any cutter resolves, and the result never depends on what
// was measured before).
const ROUNDINGS_PER_MM = 1e9
// Past this a number is no cut-file curve (such coordinates are refused later); measure it as it is.
const MAX_ROUNDED_MM = 1e6


/**
 * Remembered lengths by shape for one analysis (nothing is shared between
 * analyses): the command, its rounded numbers and the length in one flat row
 * per shape, found through a numeric hash of the rounded numbers (no key
 * string per curve).
 */
export class CurveLengthMemory {
  private readonly rememberedByHash = new Map<number, Float64Array[]>()
  private rememberedCount = 0
  // The shape being looked up: the command code, then its numbers in whole nanometres from the origin.
  private readonly shape = new Float64Array(8)

  /**
   * svg-path-properties' length of one absolute C, Q or A segment (command as
   * a char code, its numbers at numbers[offset …] in svgpath's order) starting
   * at (fromX, fromY).
   */
  measure(fromX: number, fromY: number, command: number, numbers: ArrayLike<number>, offset: number): number {
    const count = curveNumberCount(command)
    const { shape } = this
    if (!roundShape(shape, fromX, fromY, command, numbers, offset, count)) return lengthAsDrawn(fromX, fromY, command, numbers, offset, count)
    const hash = shapeHash(shape, count)
    const row = rememberedRow(shape, this.rememberedByHash.get(hash), count)
    if (row !== undefined) return row[count + 1]
    const lengthMm = lengthFromOrigin(shape, command, count)
    // svg-path-properties' arc solver answers NaN for some arcs whose radii just fit (a square root of a rounding error
    // below zero); which ones depends on the last bits, so the arc as drawn may still measure.
    if (Number.isNaN(lengthMm)) return lengthAsDrawn(fromX, fromY, command, numbers, offset, count)
    if (this.rememberedCount >= MAX_REMEMBERED_CURVES) {
      this.rememberedByHash.clear()
      this.rememberedCount = 0
    }
    const remembered = new Float64Array(count + 2)
    remembered.set(shape.subarray(0, count + 1))
    remembered[count + 1] = lengthMm
    const rows = this.rememberedByHash.get(hash)
    if (rows === undefined) this.rememberedByHash.set(hash, [remembered])
    else rows.push(remembered)
    this.rememberedCount++
    return lengthMm
  }
}

/**
 * The shape's length as svg-path-properties measures the path "M0 0" and the
 * segment in `shape` (its numbers written as text and read back, which gives
 * the same numbers): arcs and cubics by the same arithmetic without the
 * library's objects (`curveLengthPort.ts`), quadratics by the library.
 */
function lengthFromOrigin(shape: Float64Array, command: number, count: number): number {
  const number = (position: number) => shape[position] / ROUNDINGS_PER_MM
  // The library's path reader takes a flag as set when it reads exactly 1.
  if (command === CURVE_ARC) return arcLengthFromOrigin(number(1), number(2), number(3), number(4) === 1, number(5) === 1, number(6), number(7))
  if (command === CURVE_CUBIC) return cubicLengthFromOrigin(number(1), number(2), number(3), number(4), number(5), number(6))
  return new svgPathProperties(pathDataFromOrigin(shape, command, count)).getTotalLength()
}

function lengthAsDrawn(fromX: number, fromY: number, command: number, numbers: ArrayLike<number>, offset: number, count: number): number {
  return new svgPathProperties(`M${fromX} ${fromY}${String.fromCharCode(command)}${Array.prototype.slice.call(numbers, offset, offset + count).join(' ')}`).getTotalLength()
}

/**
 * Writes the command and the segment's numbers from the origin in whole
 * nanometres into `shape`; false when a number is too large to round.
 */
function roundShape(shape: Float64Array, fromX: number, fromY: number, command: number, numbers: ArrayLike<number>, offset: number, count: number): boolean {
  const isArc = command === CURVE_ARC
  shape[0] = command
  for (let position = 1; position <= count; position++) {
    // Only an arc's end point is a position; its radii, rotation and flags stay as they are (flags round to themselves).
    const origin = isArc ? (position === 6 ? fromX : position === 7 ? fromY : 0) : position % 2 === 1 ? fromX : fromY
    const value = numbers[offset + position - 1] - origin
    if (!(Math.abs(value) <= MAX_ROUNDED_MM)) return false
    // + 0 turns −0 into +0, so a shape and its copies agree.
    shape[position] = Math.round(value * ROUNDINGS_PER_MM) + 0
  }
  return true
}

/** FNV-style mix of the rounded numbers' low and high 32-bit halves (they are integers below 2^53). */
function shapeHash(shape: Float64Array, count: number): number {
  let hash = 0x811c9dc5 ^ shape[0]
  for (let position = 1; position <= count; position++) {
    const value = shape[position]
    hash = Math.imul(hash ^ (value | 0), 0x01000193)
    hash = Math.imul(hash ^ Math.floor(value / 4294967296), 0x01000193)
  }
  return hash
}

/** The remembered row of the shape in `shape`, if any (rows of one hash differ only on a hash collision). */
function rememberedRow(shape: Float64Array, rows: Float64Array[] | undefined, count: number): Float64Array | undefined {
  if (rows === undefined) return undefined
  for (const row of rows) if (isShapeRow(shape, row, count)) return row
  return undefined
}

function isShapeRow(shape: Float64Array, row: Float64Array, count: number): boolean {
  if (row.length !== count + 2) return false
  for (let position = 0; position <= count; position++) if (row[position] !== shape[position]) return false
  return true
}

function pathDataFromOrigin(shape: Float64Array, command: number, count: number): string {
  let numbersText = ''
  for (let position = 1; position <= count; position++) numbersText += ` ${shape[position] / ROUNDINGS_PER_MM}`
  return `M0 0${String.fromCharCode(command)}${numbersText}`
}
