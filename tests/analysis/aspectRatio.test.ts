import { describe, expect, it } from 'vitest'
import { analyze, cutPath } from './helpers'

// SVG 1.1 §7.8 and SVG 2 §8.6: preserveAspectRatio's initial value is "xMidYMid meet": the viewBox is scaled by the
// smaller ratio and centred in the viewport. A 100 × 100 viewBox in a 200 × 100 mm viewport: scale 1, 50 mm free
// on each side; the line from user (0, 50) to (100, 50) lands from x = 50 to 150 mm (exact, tolerance 1e-9).
const document = (preserveAspectRatio: string, body = cutPath('M0 50H100')) =>
  `<svg xmlns="http://www.w3.org/2000/svg" width="200mm" height="100mm" viewBox="0 0 100 100" ${preserveAspectRatio}>${body}</svg>`

describe('preserveAspectRatio', () => {
  it('centres the viewBox when the attribute is missing or blank (xMidYMid meet)', () => {
    for (const attribute of ['', 'preserveAspectRatio=""', 'preserveAspectRatio="xMidYMid meet"']) {
      const result = analyze(document(attribute))
      expect(result.bbox.x).toBeCloseTo(50, 9)
      expect(result.bbox.width).toBeCloseTo(100, 9)
      expect(result.bbox.y).toBeCloseTo(50, 9)
    }
  })

  it('aligns to the left with xMinYMin and to the right with xMaxYMax', () => {
    expect(analyze(document('preserveAspectRatio="xMinYMin meet"')).bbox.x).toBeCloseTo(0, 9)
    expect(analyze(document('preserveAspectRatio="xMaxYMax"')).bbox.x).toBeCloseTo(100, 9)
  })

  it('centres a nested viewBox too (20 × 10 in 100 × 100: scale 5, 25 mm free above and below)', () => {
    const body = `<svg width="100" height="100" viewBox="0 0 20 10">${cutPath('M0 0H20')}</svg>`
    const result = analyze(`<svg xmlns="http://www.w3.org/2000/svg" width="100mm" height="100mm" viewBox="0 0 100 100">${body}</svg>`)
    expect(result.bbox.y).toBeCloseTo(25, 9)
    expect(result.cut.lengthMm).toBeCloseTo(100, 9)
  })
})
