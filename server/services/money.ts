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

/** What a cut costs: billed machine minutes and the setup at the cutter's rate, plus the stock sheets. */
export function cutCharge(input: { machineMinutes: number; incrementMinutes: number; setupMinutes: number; ratePerMinuteMinor: number; materialMinor: number }): number {
  return (billedMinutes(input.machineMinutes, input.incrementMinutes) + input.setupMinutes) * input.ratePerMinuteMinor + input.materialMinor
}
