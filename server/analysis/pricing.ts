// Rounding noise in a sum of times must not bill a whole extra increment.
const BILLING_EPSILON_MINUTES = 1e-9

/** Machine minutes rounded up to the cutter's billing increment. */
export function billableMinutes(totalS: number, incrementMinutes: number): number {
  const minutes = totalS / 60
  if (incrementMinutes <= 0) return minutes
  return Math.ceil(minutes / incrementMinutes - BILLING_EPSILON_MINUTES) * incrementMinutes
}

/** Price in integer minor units: billed minutes at the rate plus the material for the part's bounding box. */
export function priceMinor(minutes: number, pricePerMinuteMinor: number, bboxAreaMm2: number, materialPriceMinorPerM2: number): number {
  const machineMinor = Math.round(minutes * pricePerMinuteMinor)
  const materialMinor = Math.ceil((bboxAreaMm2 / 1e6) * materialPriceMinorPerM2)
  return machineMinor + materialMinor
}
