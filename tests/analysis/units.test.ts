import { describe, expect, it } from 'vitest'
import { analyze, cutPath } from './helpers'

const line100 = cutPath('M0 0H100')

describe('document units and viewBox', () => {
  // CSS Values and Units Level 3 §6.2: 1in = 25.4mm = 96px, 1pt = 1/72in, 1pc = 12pt, 1cm = 10mm, 1Q = 0.25mm.
  it.each([
    ['100mm', 100],
    ['10cm', 100],
    ['400Q', 100],
    ['1in', 25.4],
    ['72pt', 25.4],
    ['6pc', 25.4],
    ['96px', 25.4],
    ['96', 25.4],
  ])('a width of %s spanning a 100-unit viewBox makes a 100-unit line %f mm long', (width, expectedMm) => {
    const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" viewBox="0 0 100 10">${line100}</svg>`
    expect(analyze(svg).cut.lengthMm).toBeCloseTo(expectedMm, 9)
  })

  // CSS Values and Units: without a viewBox one user unit is one CSS px = 25.4/96 mm.
  it('reads user units as CSS px when there is no viewBox, and honours --dpi', () => {
    const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="500" height="50">${line100}</svg>`
    expect(analyze(svg).cut.lengthMm).toBeCloseTo((100 * 25.4) / 96, 9)
    expect(analyze(svg, { dpi: 72 }).cut.lengthMm).toBeCloseTo((100 * 25.4) / 72, 9)
  })

  // SVG 1.1 §7.8: with preserveAspectRatio="none" the viewBox is stretched to the viewport on each axis.
  it('applies a non-uniform viewBox with preserveAspectRatio="none"', () => {
    const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="200mm" height="50mm" viewBox="0 0 100 100" preserveAspectRatio="none">${cutPath('M0 0H100V100')}</svg>`
    expect(analyze(svg).cut.lengthMm).toBeCloseTo(200 + 50, 9)
  })

  // SVG 1.1 §7.8: "xMidYMid meet" scales by the smaller ratio and centres; "xMinYMin slice" by the larger one.
  it('centres a uniform viewBox for meet and scales by the larger ratio for slice', () => {
    const document = (alignment: string) =>
      `<svg xmlns="http://www.w3.org/2000/svg" width="200mm" height="100mm" viewBox="10 20 50 50" preserveAspectRatio="${alignment}">${cutPath('M10 20H60')}</svg>`
    const meet = analyze(document('xMidYMid meet'))
    expect(meet.cut.lengthMm).toBeCloseTo(100, 9)
    expect(meet.bbox.x).toBeCloseTo(50, 9)
    expect(meet.bbox.y).toBeCloseTo(0, 9)
    const slice = analyze(document('xMinYMin slice'))
    expect(slice.cut.lengthMm).toBeCloseTo(200, 9)
    expect(slice.bbox.x).toBeCloseTo(0, 9)
  })

  it('derives a missing height from the viewBox aspect ratio', () => {
    const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="100mm" viewBox="0 0 50 200">${cutPath('M0 0V200')}</svg>`
    expect(analyze(svg).cut.lengthMm).toBeCloseTo(400, 9)
  })
})
