/**
 * Reads path data into absolute user-space steps without svgpath: moves,
 * lines and closes as points (M, L, H, V, Z), and cubic, quadratic and arc
 * segments (C, Q, A) as the absolute segments svgpath's abs() writes. Most of
 * what drawing programs export for cut patterns is like this, and one scan
 * replaces svgpath's parsing. It follows svgpath's grammar (numbers, arc
 * flags, implicit repeats, `m` pairs becoming `l`), so both read the same
 * numbers; anything it does not accept — S or T, an exponent, an unusual
 * separator, a syntax error — makes it answer false, and the caller uses
 * svgpath, which also words the error messages.
 */
import { grownArray } from './growArray'

export const STEP_MOVE = 0
export const STEP_LINE = 1
export const STEP_CLOSE = 2
/** A C, Q or A segment: see `curveCommand` and `curveNumbers`. */
export const STEP_CURVE = 3

/** Curve commands as char codes (absolute, as svgpath's abs() writes them). */
export const CURVE_CUBIC = 0x43 // C
export const CURVE_QUADRATIC = 0x51 // Q
export const CURVE_ARC = 0x41 // A

/** Numbers kept per curve: C has 6, Q 4, A 7 (rx, ry, rotation, large-arc flag, sweep flag, x, y). */
export const CURVE_STRIDE = 7

/** How many of a curve's CURVE_STRIDE slots its command uses. */
export function curveNumberCount(command: number): number {
  return command === CURVE_CUBIC ? 6 : command === CURVE_QUADRATIC ? 4 : 7
}

const CHAR_SPACE = 0x20
const CHAR_TAB = 0x09
const CHAR_LINE_FEED = 0x0a
const CHAR_CARRIAGE_RETURN = 0x0d
const CHAR_COMMA = 0x2c
const CHAR_PLUS = 0x2b
const CHAR_MINUS = 0x2d
const CHAR_DOT = 0x2e
const CHAR_ZERO = 0x30
const CHAR_NINE = 0x39
const LOWER_CASE_BIT = 0x20
const CHAR_ONE = 0x31

// Numbers per segment (svgpath's paramCounts) for the curves read here.
const CURVE_PARAMETERS: Record<number, number> = { 0x63 /* c */: 6, 0x71 /* q */: 4, 0x61 /* a */: 7 }

// Powers of ten up to 1e22 are exact doubles, and so is any integer below 2^53:
// their quotient is then correctly rounded, the same double parseFloat gives.
const EXACT_POWERS_OF_TEN = Array.from({ length: 23 }, (_, exponent) => Number(`1e${exponent}`))
const MAX_EXACT_DIGITS = 15

/** The steps of one path, reused from element to element so a path costs no allocation. */
export class PathSteps {
  kind = new Uint8Array(64)
  x = new Float64Array(64)
  y = new Float64Array(64)
  count = 0
  /**
   * The curves in step order, one per STEP_CURVE, as svgpath's abs() writes
   * them but flat: curve i is `curveCommand[i]` ('C', 'Q' or 'A' as a char
   * code) with its numbers at curveNumbers[CURVE_STRIDE·i …]. No array or
   * boxed number per curve.
   */
  curveCommand = new Uint8Array(16)
  curveNumbers = new Float64Array(16 * CURVE_STRIDE)
  curveCount = 0
  /** Whether a number was relative (added to the current point): svgpath transforms those before adding, so only all-absolute curves may skip it under a matrix. */
  hasRelative = false
  private text = ''
  private index = 0
  private number = 0

  /** Fills the steps from `pathData`; false when it has something only svgpath reads. */
  read(pathData: string): boolean {
    this.text = pathData
    this.index = 0
    this.count = 0
    this.curveCount = 0
    this.hasRelative = false
    let currentX = 0
    let currentY = 0
    let subpathX = 0
    let subpathY = 0
    this.skipSpaces()
    while (this.index < pathData.length) {
      const command = pathData.charCodeAt(this.index)
      const lowerCase = command | LOWER_CASE_BIT
      const relative = command === lowerCase
      if (this.count === 0 && lowerCase !== 0x6d /* m */) return false
      this.index++
      this.skipSpaces()
      if (lowerCase === 0x7a /* z */) {
        this.push(STEP_CLOSE, subpathX, subpathY)
        currentX = subpathX
        currentY = subpathY
        continue
      }
      const curveParameters = CURVE_PARAMETERS[lowerCase]
      if (curveParameters !== undefined) {
        if (relative) this.hasRelative = true
        const end = this.readCurves(command, curveParameters, relative, currentX, currentY)
        if (!end) return false
        currentX = end[0]
        currentY = end[1]
        continue
      }
      if (lowerCase !== 0x6d && lowerCase !== 0x6c /* l */ && lowerCase !== 0x68 /* h */ && lowerCase !== 0x76 /* v */) return false
      // svgpath turns a first `m` into `M`, and the pairs after an `m` into `l`; relative values add to the current point as svgpath's abs() does.
      const firstIsRelative = relative && this.count > 0
      let firstPair = true
      for (;;) {
        const addsToCurrent = firstPair ? firstIsRelative : relative
        if (addsToCurrent) this.hasRelative = true
        if (lowerCase === 0x68 || lowerCase === 0x76) {
          if (!this.scanNumber()) return false
          if (lowerCase === 0x68) currentX = addsToCurrent ? this.number + currentX : this.number
          else currentY = addsToCurrent ? this.number + currentY : this.number
        } else {
          if (!this.scanNumber()) return false
          const x = this.number
          this.skipSeparator()
          if (!this.scanNumber()) return false
          currentX = addsToCurrent ? x + currentX : x
          currentY = addsToCurrent ? this.number + currentY : this.number
        }
        const commaFound = this.skipSeparator()
        if (lowerCase === 0x6d && firstPair) {
          this.push(STEP_MOVE, currentX, currentY)
          subpathX = currentX
          subpathY = currentY
        } else {
          this.push(STEP_LINE, currentX, currentY)
        }
        firstPair = false
        if (commaFound) continue
        if (this.index >= pathData.length || !startsNumber(pathData.charCodeAt(this.index))) break
      }
    }
    return true
  }

  /**
   * One curve command with its implicit repeats, from the current point;
   * returns the new current point, or undefined on anything svgpath would
   * refuse. Relative numbers add to the current point as in svgpath's abs():
   * every pair of C and Q, only the end point of A.
   */
  private readCurves(command: number, parameters: number, relative: boolean, fromX: number, fromY: number): [number, number] | undefined {
    const isArc = (command | LOWER_CASE_BIT) === 0x61
    const absoluteCommand = command & ~LOWER_CASE_BIT
    let currentX = fromX
    let currentY = fromY
    for (;;) {
      const curve = this.beginCurve(absoluteCommand)
      const numbers = this.curveNumbers
      const offset = curve * CURVE_STRIDE
      let commaFound = false
      for (let position = 1; position <= parameters; position++) {
        const isFlag = isArc && (position === 4 || position === 5)
        if (!(isFlag ? this.scanFlag() : this.scanNumber())) return undefined
        const isX = isArc ? position === 6 : position % 2 === 1
        const isY = isArc ? position === 7 : position % 2 === 0
        numbers[offset + position - 1] = relative && isX ? this.number + currentX : relative && isY ? this.number + currentY : this.number
        commaFound = this.skipSeparator()
      }
      currentX = numbers[offset + parameters - 2]!
      currentY = numbers[offset + parameters - 1]!
      this.push(STEP_CURVE, currentX, currentY)
      if (commaFound) continue
      if (this.index >= this.text.length || !startsNumber(this.text.charCodeAt(this.index))) return [currentX, currentY]
    }
  }

  /** A new curve slot for `command`, growing the flat arrays when full. */
  private beginCurve(command: number): number {
    if (this.curveCount === this.curveCommand.length) {
      const size = this.curveCount * 2
      this.curveCommand = grownArray(this.curveCommand, size)
      this.curveNumbers = grownArray(this.curveNumbers, size * CURVE_STRIDE)
    }
    this.curveCommand[this.curveCount] = command
    return this.curveCount++
  }

  /** svgpath's arc flag: one character, 0 or 1. */
  private scanFlag(): boolean {
    const code = this.text.charCodeAt(this.index)
    if (code !== CHAR_ZERO && code !== CHAR_ONE) return false
    this.number = code - CHAR_ZERO
    this.index++
    return true
  }

  private push(kind: number, x: number, y: number): void {
    if (this.count === this.kind.length) {
      const size = this.count * 2
      this.kind = grownArray(this.kind, size)
      this.x = grownArray(this.x, size)
      this.y = grownArray(this.y, size)
    }
    this.kind[this.count] = kind
    this.x[this.count] = x
    this.y[this.count] = y
    this.count++
  }

  private skipSpaces(): void {
    while (this.index < this.text.length && isSpace(this.text.charCodeAt(this.index))) this.index++
  }

  /** Spaces, then at most one comma and the spaces after it; true when there was a comma (a number must follow). */
  private skipSeparator(): boolean {
    this.skipSpaces()
    if (this.text.charCodeAt(this.index) !== CHAR_COMMA) return false
    this.index++
    this.skipSpaces()
    return true
  }

  /** One number in svgpath's grammar (no leading zero before a digit), without an exponent; into `this.number`. */
  private scanNumber(): boolean {
    const { text } = this
    const start = this.index
    let index = start
    let code = text.charCodeAt(index)
    const negative = code === CHAR_MINUS
    if (negative || code === CHAR_PLUS) code = text.charCodeAt(++index)
    let mantissa = 0
    let digits = 0
    let fractionDigits = 0
    if (code === CHAR_ZERO && isDigit(text.charCodeAt(index + 1))) return false
    while (isDigit(code)) {
      mantissa = mantissa * 10 + (code - CHAR_ZERO)
      digits++
      code = text.charCodeAt(++index)
    }
    if (code === CHAR_DOT) {
      code = text.charCodeAt(++index)
      while (isDigit(code)) {
        mantissa = mantissa * 10 + (code - CHAR_ZERO)
        digits++
        fractionDigits++
        code = text.charCodeAt(++index)
      }
    }
    if (digits === 0 || (code | LOWER_CASE_BIT) === 0x65 /* e */) return false
    this.index = index
    const magnitude =
      digits <= MAX_EXACT_DIGITS ? mantissa / EXACT_POWERS_OF_TEN[fractionDigits]! : Number.parseFloat(text.slice(negative ? start + 1 : start, index))
    // svgpath adds 0.0 to every number, which turns −0 into +0.
    this.number = (negative ? -magnitude : magnitude) + 0
    return true
  }
}

function isDigit(code: number): boolean {
  return code >= CHAR_ZERO && code <= CHAR_NINE
}

function startsNumber(code: number): boolean {
  return isDigit(code) || code === CHAR_MINUS || code === CHAR_PLUS || code === CHAR_DOT
}

function isSpace(code: number): boolean {
  return code === CHAR_SPACE || code === CHAR_TAB || code === CHAR_LINE_FEED || code === CHAR_CARRIAGE_RETURN
}
