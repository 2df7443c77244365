import { AnalysisInputError } from './errors'
import { NUMBER_GRAMMAR, parseNumberAttribute, shorten } from './numbers'

// CSS Values and Units Level 3, §6.2 absolute lengths: 1in = 2.54cm = 96px, 1pt = 1/72in, 1pc = 12pt, 1Q = 1/4mm.
const MM_PER_INCH = 25.4
const ABSOLUTE_UNIT_MM: Record<string, number> = {
  mm: 1,
  cm: 10,
  q: 0.25,
  in: MM_PER_INCH,
  pt: MM_PER_INCH / 72,
  pc: MM_PER_INCH / 6,
}

const LENGTH_PATTERN = new RegExp(String.raw`^\s*(${NUMBER_GRAMMAR})\s*([a-zA-Z%]*)\s*$`)

export function mmPerPixel(dpi: number): number {
  return MM_PER_INCH / dpi
}

/**
 * A root width/height in mm. Unitless and px use `dpi`; a percentage has no
 * absolute size and gives undefined, as does an absent attribute.
 */
export function parseAbsoluteLengthMm(value: string | undefined, attributeName: string, dpi: number): number | undefined {
  if (value === undefined || value.trim() === '') return undefined
  const match = LENGTH_PATTERN.exec(value)
  if (!match) {
    throw new AnalysisInputError('badUnit', `The drawing's ${attributeName}="${shorten(value)}" is not a length Kerfbook understands (use mm, cm, in, pt, pc or px).`)
  }
  const number = parseNumberAttribute(match[1], attributeName, Number.NaN)
  const unit = match[2]!.toLowerCase()
  if (unit === '%') return undefined
  if (unit === '' || unit === 'px') return number * mmPerPixel(dpi)
  const unitMm = ABSOLUTE_UNIT_MM[unit]
  if (unitMm === undefined) {
    throw new AnalysisInputError('badUnit', `The drawing's ${attributeName} uses the unit "${match[2]}", which has no fixed size. Set the document size in mm, cm, in, pt, pc or px.`)
  }
  return number * unitMm
}

// CSS Values and Units Level 3, §6.2: the user unit of SVG is the CSS px, 96 to the inch whatever the drawing's dpi.
const USER_UNITS_PER_MM = 96 / MM_PER_INCH

/**
 * A length attribute inside the drawing (x, width, r, …) in user units:
 * a number, px, an absolute unit (SVG 2 §8.7 and CSS Values 3: 1mm = 96/25.4
 * user units), or a percentage of `percentOf` (the viewport size the
 * attribute refers to); `fallback` when absent, or when a percentage has
 * nothing known to refer to.
 */
export function parseUserLength(value: string | undefined, attributeName: string, percentOf: number | undefined, fallback: number): number {
  if (value === undefined || value.trim() === '') return fallback
  const match = LENGTH_PATTERN.exec(value)
  if (!match) return parseNumberAttribute(value, attributeName, fallback)
  const unit = match[2]!.toLowerCase()
  if (unit === '' || unit === 'px') return parseNumberAttribute(match[1], attributeName, fallback)
  const number = parseNumberAttribute(match[1], attributeName, fallback)
  if (unit === '%') return percentOf === undefined ? fallback : (number / 100) * percentOf
  const unitMm = ABSOLUTE_UNIT_MM[unit]
  if (unitMm === undefined) {
    throw new AnalysisInputError('badUnit', `A shape's ${attributeName}="${shorten(value)}" uses the unit "${match[2]}", which depends on fonts or the screen. Use numbers, px, mm, cm, in, pt, pc or %.`)
  }
  return number * unitMm * USER_UNITS_PER_MM
}
