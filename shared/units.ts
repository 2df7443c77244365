import { z } from 'zod'

// Lengths are millimetres everywhere inside Kerfbook; a person may read them in inches. Conversion happens only
// when a number is shown.
export const LENGTH_UNITS = ['mm', 'in'] as const
export type LengthUnit = (typeof LENGTH_UNITS)[number]
export const LENGTH_UNIT_LABELS: Record<LengthUnit, string> = { mm: 'Millimetres (mm)', in: 'Inches (in)' }
export const lengthUnitSchema = z.object({ lengthUnit: z.enum(LENGTH_UNITS, { error: 'Choose millimetres or inches.' }) })

// The international inch is exactly 25.4 mm (1959 agreement; NIST Special Publication 811, appendix B.8).
export const MM_PER_INCH = 25.4

/** A length for people to read: two decimals in mm; three in inches, as a 0.1 mm kerf reads 0.004 in. */
export function formatLength(valueMm: number, unit: LengthUnit = 'mm'): string {
  return unit === 'in' ? `${Number((valueMm / MM_PER_INCH).toFixed(3))} in` : `${Number(valueMm.toFixed(2))} mm`
}

/** A width × height, the unit named once: whole-ish mm, or inches to the hundredth ("600 × 400 mm", "23.62 × 15.75 in"). */
export function formatSize(widthMm: number, heightMm: number, unit: LengthUnit = 'mm'): string {
  const digits = (valueMm: number) => (unit === 'in' ? Number((valueMm / MM_PER_INCH).toFixed(2)) : Number(valueMm.toFixed(1)))
  return `${digits(widthMm)} × ${digits(heightMm)} ${unit}`
}

/** A place on a drawing, x and y from its top-left corner, the unit named once: tenths of a mm or hundredths of an inch. */
export function formatPoint(xMm: number, yMm: number, unit: LengthUnit = 'mm'): string {
  const digits = (valueMm: number) => (unit === 'in' ? (valueMm / MM_PER_INCH).toFixed(2) : valueMm.toFixed(1))
  return `x ${digits(xMm)}, y ${digits(yMm)} ${unit}`
}

/** A cut path's whole length: metres to the centimetre, or inches to the tenth (the same order of rounding). */
export function formatPathLength(lengthMm: number, unit: LengthUnit = 'mm'): string {
  return unit === 'in' ? `${(lengthMm / MM_PER_INCH).toFixed(1)} in` : `${(lengthMm / 1000).toFixed(2)} m`
}

/** An area: whole mm², or square inches with two decimals. */
export function formatArea(valueMm2: number, unit: LengthUnit = 'mm'): string {
  return unit === 'in' ? `${Number((valueMm2 / (MM_PER_INCH * MM_PER_INCH)).toFixed(2))} in²` : `${Math.round(valueMm2)} mm²`
}
