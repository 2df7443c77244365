import { describe, expect, it } from 'vitest'
import { findingsOf, rectanglePath, SHEET_OUTLINE } from './helpers'

describe('limits of the contour checks, at their edges', () => {
  // The project's rule (no source): a cut shorter than twice the kerf is a burnt dot. With a 0.2 mm kerf the limit
  // is 0.4 mm, so 0.3 mm is flagged and 0.45 mm is not; half the limit (0.2 mm) would let 0.3 mm through.
  it('flags cuts just under twice the kerf and not just over', () => {
    const sites = findingsOf('tiny-segment', ['M10 10h0.3', 'M20 10h0.45'], { kerfMm: 0.2 })
    expect(sites).toMatchObject([{ limitMm: 0.4, contours: [0] }])
    expect(sites[0]!.valueMm).toBeCloseTo(0.3, 6)
  })

  // A hole that is a circle is measured by its diameter (minimum hole of one thickness: common practice, no source).
  // A regular 40-gon turned by half a step has its box 2r·cos(π/40) ≈ 0.997 × the diameter across, so only a
  // correct circle fit (Kåsa's least squares: centre and radius of the circle through the points) gives 2r here.
  it('measures a circular hole by the diameter of the fitted circle, not by its box', () => {
    const radiusMm = 0.5
    const sides = 40
    const points = Array.from({ length: sides }, (_, index) => {
      const angle = ((index + 0.5) * 2 * Math.PI) / sides
      return `${50 + radiusMm * Math.cos(angle)} ${50 + radiusMm * Math.sin(angle)}`
    })
    const [hole, ...rest] = findingsOf('small-hole', [SHEET_OUTLINE, `M${points.join('L')}Z`], { thicknessMm: 3, kerfMm: 0.2 })
    expect(rest).toEqual([])
    expect(hole!.valueMm).toBeCloseTo(2 * radiusMm, 6)
    // Not a circle: a 2 × 0.8 mm slot is measured by the smaller side of its box.
    const [slot] = findingsOf('small-hole', [SHEET_OUTLINE, rectanglePath(40, 40, 2, 0.8)], { thicknessMm: 3, kerfMm: 0.2 })
    expect(slot!.valueMm).toBeCloseTo(0.8, 6)
  })
})
