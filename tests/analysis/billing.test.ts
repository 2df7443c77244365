import { describe, expect, it } from 'vitest'
import { fitOnSheet } from '../../server/analysis/sheetFit'

describe('sheet fit', () => {
  const base = { sheetWidthMm: 600, sheetHeightMm: 400, bedWidthMm: 1000, bedHeightMm: 1000, marginMm: 10, spacingMm: 2 }

  // Grid arithmetic: n parts of width w with n−1 gaps g fit in U when n·w + (n−1)·g ≤ U.
  it('counts grid copies with spacing between them', () => {
    // Usable 580 × 380: ⌊582/102⌋ = 5 across, ⌊382/52⌋ = 7 down.
    expect(fitOnSheet({ ...base, partWidthMm: 100, partHeightMm: 50 })).toEqual({ fits: true, rotated: false, copies: 35, fitsBed: true })
  })

  it('turns the part when only that fits', () => {
    expect(fitOnSheet({ ...base, partWidthMm: 300, partHeightMm: 500 })).toMatchObject({ fits: true, rotated: true, copies: 1 })
  })

  it('reports a part larger than the sheet both ways', () => {
    expect(fitOnSheet({ ...base, partWidthMm: 700, partHeightMm: 700 })).toMatchObject({ fits: false, copies: 0, fitsBed: true })
  })

  it('limits the usable sheet by the bed', () => {
    expect(fitOnSheet({ ...base, bedWidthMm: 200, bedHeightMm: 200, partWidthMm: 250, partHeightMm: 100 })).toMatchObject({ fits: false, fitsBed: false })
  })
})
