import { describe, expect, it } from 'vitest'
import { billedMinutes, percentOf, priceCut, withBuffer } from '../../server/services/money'

// Hand-worked figures of the workshop's price list (README, "A job's price"); money in integer minor units.
describe('the one price of a cut', () => {
  it('rounds the cutting minutes up to the increment and adds the setup after rounding', () => {
    // 4.2 cutting minutes in 5-minute increments → 5, plus 3 setup minutes → 8 min × 80 = 640; 2 sheets × 1500 = 3000.
    expect(priceCut({ cutMinutes: 4.2, incrementMinutes: 5, setupMinutes: 3, ratePerMinuteMinor: 80, sheetCount: 2, sheetPriceMinor: 1500 })).toEqual({
      billableMinutes: 8,
      machinePriceMinor: 640,
      materialPriceMinor: 3000,
      totalPriceMinor: 3640,
    })
  })

  it('bills an exact increment as it is, despite floating-point noise in a sum of times', () => {
    expect(billedMinutes(0.1 * 3 * 10, 3)).toBe(3)
    expect(billedMinutes(0, 1)).toBe(0)
  })

  it('rounds a percentage half up once, at the end', () => {
    expect(percentOf(1234, 20)).toBe(247)
    expect(withBuffer(1000, 20)).toBe(1200)
  })
})
