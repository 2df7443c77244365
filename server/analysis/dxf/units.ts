import { AnalysisInputError } from '../errors'

// The international yard and pound agreement (1959): 1 in = 25.4 mm exactly; a foot is 12 in, a yard 36 in, a mil 1/1000 in.
const MM_PER_INCH = 25.4

/**
 * $INSUNITS codes (the DXF reference's HEADER section, from memory) that a
 * cut file can sensibly use, with their size in mm. Others (miles,
 * kilometres, astronomical units, …) are refused rather than guessed.
 */
const MM_PER_INSUNITS_CODE: Readonly<Record<number, number>> = {
  1: MM_PER_INCH,
  2: 12 * MM_PER_INCH,
  4: 1,
  5: 10,
  6: 1000,
  9: MM_PER_INCH / 1000,
  10: 36 * MM_PER_INCH,
  13: 0.001,
  14: 100,
}
const UNITLESS = 0

export interface DrawingUnits {
  mmPerUnit: number
  /** The file does not state its units, so millimetres are assumed (the member hears of it). */
  assumed: boolean
}

/** The size of one drawing unit in mm from the header's $INSUNITS; unitless or absent counts as mm (`assumed`). */
export function drawingUnits(insUnits: unknown): DrawingUnits {
  if (insUnits === undefined || insUnits === UNITLESS) {
    return { mmPerUnit: 1, assumed: true }
  }
  const mmPerUnit = typeof insUnits === 'number' ? MM_PER_INSUNITS_CODE[insUnits] : undefined
  if (mmPerUnit === undefined) {
    throw new AnalysisInputError('badUnit', `The DXF file is drawn in units Kerfbook does not cut in ($INSUNITS = ${String(insUnits).slice(0, 12)}). Set the drawing units to millimetres, centimetres, metres or inches and export again.`)
  }
  return { mmPerUnit, assumed: false }
}
