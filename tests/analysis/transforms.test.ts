import { describe, expect, it } from 'vitest'
import { analyze, cutPath, mmDocument, ramanujanPerimeter } from './helpers'

describe('transforms', () => {
  // SVG 1.1 §7.4–7.5: nested transforms compose as parent · child; translate(tx ty) then scale(s) maps (x, y) to (s·x + tx, s·y + ty).
  it('composes nested group transforms in document order', () => {
    const svg = mmDocument(`<g transform="translate(10 20)"><g transform="scale(2)">${cutPath('M1 1H6')}</g></g>`)
    const result = analyze(svg)
    expect(result.bbox.x).toBeCloseTo(12, 9)
    expect(result.bbox.y).toBeCloseTo(22, 9)
    expect(result.cut.lengthMm).toBeCloseTo(10, 9)
  })

  // SVG 1.1 §7.4: rotate(a cx cy) = translate(cx cy) rotate(a) translate(−cx −cy).
  it('rotates about a centre', () => {
    const result = analyze(mmDocument(`<g transform="rotate(90 50 50)">${cutPath('M50 50H60')}</g>`))
    expect(result.bbox.x).toBeCloseTo(50, 9)
    expect(result.bbox.y).toBeCloseTo(50, 9)
    expect(result.bbox.height).toBeCloseTo(10, 9)
    expect(result.bbox.width).toBeCloseTo(0, 9)
  })

  // SVG 1.1 §7.4: skewX(a) = [1 0 tan(a) 1 0 0], so a vertical segment of length h becomes h·√(1 + tan²a) long.
  it('skews a vertical line by tan(angle)', () => {
    const result = analyze(mmDocument(`<g transform="skewX(30)">${cutPath('M0 0V10')}</g>`))
    expect(result.cut.lengthMm).toBeCloseTo(10 * Math.sqrt(1 + Math.tan(Math.PI / 6) ** 2), 9)
    expect(result.bbox.width).toBeCloseTo(10 * Math.tan(Math.PI / 6), 9)
  })

  // A circle of radius r under scale(sx, sy) is an ellipse with semi-axes r·sx, r·sy; Ramanujan's second approximation gives its perimeter.
  it('measures an arc circle under non-uniform scale as the ellipse it becomes', () => {
    const r = 10
    const result = analyze(mmDocument(`<g transform="scale(3 1)">${cutPath(`M${r} 0A${r} ${r} 0 1 1 ${-r} 0A${r} ${r} 0 1 1 ${r} 0Z`, 'transform="translate(100 100)"')}</g>`))
    expect(result.cut.lengthMm / ramanujanPerimeter(3 * r, r)).toBeCloseTo(1, 5)
  })

  // Skew turns a circle into an ellipse of equal area: SVG 1.1 lets matrices act on arcs, so the engine must keep it an exact arc.
  it('keeps a skewed circle an ellipse with the area of the transformed circle', () => {
    const r = 10
    const skewDeg = 40
    const svg = mmDocument(`<g transform="translate(200 200) skewX(${skewDeg})"><circle r="${r}" fill="#f9a825"/></g>`)
    // Area scales by |det M| = 1 for a skew (linear algebra), so the area stays πr².
    expect(analyze(svg, { chordToleranceMm: 0.001 }).engrave.areaMm2 / (Math.PI * r * r)).toBeCloseTo(1, 3)
  })

  // SVG 1.1 §5.6: <use> adds translate(x, y) after its own transform; href and xlink:href both name the target.
  it('draws <use> references with x/y and both href spellings', () => {
    const svg = mmDocument(`<defs>${cutPath('M0 0H10', 'id="slit"')}</defs><use href="#slit" x="5" y="7"/><use xlink:href="#slit" transform="scale(2)" x="20" y="0"/>`)
    const result = analyze(svg)
    expect(result.cut.lengthMm).toBeCloseTo(10 + 20, 9)
    expect(result.cut.openContours).toBe(2)
    expect(result.bbox.x).toBeCloseTo(5, 9)
    expect(result.bbox.width).toBeCloseTo(60 - 5, 9)
  })

  // SVG 1.1 §5.6 with §7.8: a symbol's viewBox maps onto the width and height of the <use> that shows it.
  it('scales a symbol by its viewBox into the use element size', () => {
    const svg = mmDocument(`<symbol id="mark" viewBox="0 0 10 10">${cutPath('M0 5H10')}</symbol><use href="#mark" x="100" y="100" width="40" height="40"/>`)
    const result = analyze(svg)
    expect(result.cut.lengthMm).toBeCloseTo(40, 9)
    expect(result.bbox.x).toBeCloseTo(100, 9)
    expect(result.bbox.y).toBeCloseTo(120, 9)
  })

  // SVG 1.1 F.6.5: sweep-flag 1 runs in the positive-angle direction, so a half circle from (0,0) to (20,0)
  // passes through (10,−10). §7.4: scale(1 −1) maps it to (10,10); after translate(0 100) y runs from 100 to 110.
  it('keeps an arc on its side under a mirroring transform', () => {
    const result = analyze(mmDocument(`<g transform="translate(0 100) scale(1 -1)">${cutPath('M0 0 A10 10 0 0 1 20 0')}</g>`))
    expect(result.bbox.y).toBeCloseTo(100, 6)
    expect(result.bbox.height).toBeCloseTo(10, 6)
    // Within the flattening's chord tolerance.
    expect(result.cut.lengthMm).toBeCloseTo(Math.PI * 10, 3)
  })
})
