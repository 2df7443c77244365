// Money arithmetic in integer minor units (ISO 4217). A percentage is applied once, at the end,
// rounding half up: 1234 × 20 % = 246.8 → 247.
export function percentOf(amountMinor: number, percent: number): number {
  return Math.floor((amountMinor * percent + 50) / 100)
}

export function withBuffer(amountMinor: number, bufferPercent: number): number {
  return percentOf(amountMinor, 100 + bufferPercent)
}

/** Machine minutes rounded up to the cutter's billing increment. */
export function billedMinutes(minutes: number, incrementMinutes: number): number {
  return minutes <= 0 ? 0 : Math.ceil(minutes / incrementMinutes - 1e-9) * incrementMinutes
}

export interface CutPrice {
  /** Cutting minutes rounded up to the billing increment, plus the setup once, as it is. */
  billableMinutes: number
  machinePriceMinor: number
  materialPriceMinor: number
  totalPriceMinor: number
}

/**
 * The one price of a cut, for the check page, the job estimate, the booking's hold and the charge after the cut:
 * cutting minutes (machine time without setup) rounded up to the cutter's increment, plus the setup minutes,
 * at the cutter's rate; plus whole stock sheets.
 */
export function priceCut(input: {
  cutMinutes: number
  incrementMinutes: number
  setupMinutes: number
  ratePerMinuteMinor: number
  sheetCount: number
  sheetPriceMinor: number
}): CutPrice {
  const billableMinutes = billedMinutes(input.cutMinutes, input.incrementMinutes) + input.setupMinutes
  const machinePriceMinor = billableMinutes * input.ratePerMinuteMinor
  const materialPriceMinor = input.sheetCount * input.sheetPriceMinor
  return { billableMinutes, machinePriceMinor, materialPriceMinor, totalPriceMinor: machinePriceMinor + materialPriceMinor }
}

/** An amount for people to read ("€9.78"), with the currency's own number of minor digits. */
export function formatMinor(amountMinor: number, currency: string): string {
  const format = new Intl.NumberFormat('en-IE', { style: 'currency', currency })
  return format.format(amountMinor / 10 ** (format.resolvedOptions().maximumFractionDigits ?? 2))
}
