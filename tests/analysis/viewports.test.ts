import { describe, expect, it } from 'vitest'
import { analyze, cutPath, mmDocument } from './helpers'

// Expected sizes follow the SVG 2 specification: §8.2 (a nested <svg> whose width/height are absent or auto is 100 %
// of its parent viewport; x, y and percentages refer to that viewport), §8.6 (viewBox with preserveAspectRatio)
// and §5.6 (a <use> referring to an <svg>: its width and height, other than auto, replace the svg's).
// The documents are 100 × 100 mm with 1 mm user units; tolerance 1e-6 mm (straight lines, exact scales).
const TOLERANCE_MM = 1e-6

function expectBox(svg: string, x: number, y: number, width: number, height: number, lengthMm: number) {
  const result = analyze(svg)
  for (const [actual, expected] of [
    [result.bbox.x, x],
    [result.bbox.y, y],
    [result.bbox.width, width],
    [result.bbox.height, height],
    [result.cut.lengthMm, lengthMm],
  ] as [number, number][]) {
    expect(Math.abs(actual - expected)).toBeLessThan(TOLERANCE_MM)
  }
}

describe('nested SVG viewports', () => {
  it('fills the parent with a nested <svg viewBox> that has no width or height (viewBox 10 wide in 100 mm: ×10)', () => {
    expectBox(mmDocument(`<svg viewBox="0 0 10 10">${cutPath('M0 5H10')}</svg>`, 100, 100), 0, 50, 100, 0, 100)
  })

  it('reads width="auto" and "100%" as the whole parent', () => {
    for (const size of ['width="auto" height="auto"', 'width="100%" height="100%"']) {
      expectBox(mmDocument(`<svg ${size} viewBox="0 0 10 10">${cutPath('M0 5H10')}</svg>`, 100, 100), 0, 50, 100, 0, 100)
    }
  })

  it('places and sizes a nested <svg> by percentages of its parent (x 10 %, width 50 %: scale 5)', () => {
    expectBox(mmDocument(`<svg x="10%" y="20%" width="50%" height="50%" viewBox="0 0 10 10">${cutPath('M0 5H10')}</svg>`, 100, 100), 10, 45, 50, 0, 50)
  })

  it('sizes an <svg> referred to by <use width height> by the use (viewBox 10 wide, use 40 wide: ×4)', () => {
    const svg = mmDocument(`<defs><svg id="part" width="10" height="10" viewBox="0 0 10 10">${cutPath('M0 5H10')}</svg></defs><use href="#part" x="5" y="5" width="40" height="40"/>`, 100, 100)
    expectBox(svg, 5, 25, 40, 0, 40)
  })

  it('keeps the svg\'s own size when the use gives none (or auto)', () => {
    for (const size of ['', 'width="auto" height="auto"']) {
      const svg = mmDocument(`<defs><svg id="part" width="20" height="20" viewBox="0 0 10 10">${cutPath('M0 5H10')}</svg></defs><use href="#part" ${size}/>`, 100, 100)
      expectBox(svg, 0, 10, 20, 0, 20)
    }
  })

  it('draws nothing for a nested <svg> of zero width', () => {
    const result = analyze(mmDocument(`${cutPath('M0 0H10')}<svg width="0" viewBox="0 0 10 10">${cutPath('M0 5H10')}</svg>`, 100, 100))
    expect(result.cut.lengthMm).toBeCloseTo(10, 9)
  })
})
