import { Bezier } from 'bezier-js'
import { describe, expect, it } from 'vitest'
import { findingsOf, SHEET_OUTLINE } from './helpers'

// Minimum hole of one material thickness (common practice, no source): a 1 mm hole in 3 mm stock is small.
const steel3mm = { thicknessMm: 3, kerfMm: 0.2 }
const sizeOf = (d: string) => {
  const [finding, ...rest] = findingsOf('small-hole', [SHEET_OUTLINE, d], steel3mm)
  expect(rest).toEqual([])
  return finding!.valueMm!
}

/** n points on a circle, the first half a step past 0°, so no point sits on the box: the box side is 2r·cos(π/n). */
function polygonOnCircle(cx: number, cy: number, r: number, n: number, decimals: number): string {
  const points = Array.from({ length: n }, (_, i) => {
    const angle = (2 * Math.PI * (i + 0.5)) / n
    return `${(cx + r * Math.cos(angle)).toFixed(decimals)} ${(cy + r * Math.sin(angle)).toFixed(decimals)}`
  })
  return `M${points.join('L')}Z`
}

describe('the small-hole circle fit', () => {
  it('measures a circle drawn as two SVG arcs from 30° by its diameter, not its flattened box', () => {
    const r = 0.5
    const [x0, y0, x1, y1] = [50 + r * Math.cos(Math.PI / 6), 50 + r * Math.sin(Math.PI / 6), 50 - r * Math.cos(Math.PI / 6), 50 - r * Math.sin(Math.PI / 6)]
    const size = sizeOf(`M${x0} ${y0}A${r} ${r} 0 0 0 ${x1} ${y1}A${r} ${r} 0 0 0 ${x0} ${y0}Z`)
    // Diameter 2r within the fit's slack (1e-3·r); the flattened box alone is 2r·cos(15°/2…) ≈ 0.994 mm here.
    expect(Math.abs(size - 2 * r)).toBeLessThan(2e-3 * r)
  })

  it('measures a 64-point circle written with 6 decimals by its diameter (the box side is 2r·cos(π/64) = 0.99880 mm)', () => {
    expect(Math.abs(sizeOf(polygonOnCircle(50, 50, 0.5, 64, 6)) - 1)).toBeLessThan(1e-5)
  })

  it('still measures an octagon with its corners on a circle by its box (its sides fall 0.038 mm inside the circle)', () => {
    expect(sizeOf(polygonOnCircle(50, 50, 0.5, 8, 9))).toBeCloseTo(Math.cos(Math.PI / 8), 6)
  })

  it("leaves the slack above the quarter-turn cubic's radial error, measured with bezier-js", () => {
    // The standard quarter circle, control distance k = 4/3·tan(π/8): sample its radius along the curve.
    const k = (4 / 3) * Math.tan(Math.PI / 8)
    const quarter = new Bezier(1, 0, 1, k, k, 1, 0, 1)
    const worst = Math.max(...quarter.getLUT(2000).map(({ x, y }) => Math.abs(Math.hypot(x, y) - 1)))
    expect(worst).toBeGreaterThan(2e-4)
    expect(worst).toBeLessThan(1e-3)
  })
})
