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
  const unit = match[2].toLowerCase()
  if (unit === '%') return undefined
  if (unit === '' || unit === 'px') return number * mmPerPixel(dpi)
  const unitMm = ABSOLUTE_UNIT_MM[unit]
  if (unitMm === undefined) {
    throw new AnalysisInputError('badUnit', `The drawing's ${attributeName} uses the unit "${match[2]}", which has no fixed size. Set the document size in mm, cm, in, pt, pc or px.`)
  }
  return number * unitMm
}
