import { describe, expect, it } from 'vitest'
import { circlePath, findingsOf, rectanglePath, SHEET_OUTLINE } from './helpers'

// Minimum hole of one material thickness: common practice, no source. withDefaults derives it from the thickness.
const steel3mm = { thicknessMm: 3, kerfMm: 0.2 }

describe('small-hole', () => {
  it('flags a 1 mm circle in 3 mm steel (one-thickness minimum) and measures its diameter', () => {
    const [finding, ...rest] = findingsOf('small-hole', [SHEET_OUTLINE, circlePath(50, 50, 0.5)], steel3mm)
    expect(rest).toEqual([])
    expect(finding).toMatchObject({ severity: 'warning', limitMm: 3, x: 50, y: 50, contours: [1] })
    expect(finding!.valueMm).toBeCloseTo(1, 9)
  })

  it('leaves an 8 mm circle in 3 mm steel alone', () => {
    expect(findingsOf('small-hole', [SHEET_OUTLINE, circlePath(50, 50, 4)], steel3mm)).toEqual([])
  })

  it('measures a hole that is not a circle by the smaller side of its box (2 × 6 mm: 2 mm)', () => {
    const [finding] = findingsOf('small-hole', [SHEET_OUTLINE, rectanglePath(40, 40, 2, 6)], steel3mm)
    expect(finding!.valueMm).toBeCloseTo(2, 9)
  })

  it('does not call a small part (nothing around it) a hole', () => {
    expect(findingsOf('small-hole', [circlePath(50, 50, 0.5)], steel3mm)).toEqual([])
  })

  it('treats a circle among free slits as a hole in the undrawn sheet', () => {
    expect(findingsOf('small-hole', ['M0 0H100', 'M0 100H100', circlePath(50, 50, 0.5)], steel3mm)).toHaveLength(1)
  })
})
