import { describe, expect, it } from 'vitest'
import { AnalysisInputError, analyzeCutFile, withDefaults } from '../../server/analysis/index'
import { activeContentIn } from '../../server/utils/active-content'
import { analyze, CUT, cutPath, mmDocument } from './helpers'

// A document whose user unit is one CSS px: 960 px across 254 mm (CSS Values and Units 3, §6.2: 96 px = 1 in = 25.4 mm).
const pxDocument = (body: string) => `<svg xmlns="http://www.w3.org/2000/svg" width="254mm" height="254mm" viewBox="0 0 960 960">${body}</svg>`
const cutShape = (name: string, attributes: string) => `<${name} ${attributes} fill="none" stroke="${CUT}"/>`

describe('character references in attributes (XML 1.0 §4.1, §4.6)', () => {
  it('reads d="M10 10&#10;L90 10" as a line 80 mm long', () => {
    expect(analyze(mmDocument(cutPath('M10 10&#10;L90 10'), 100, 100)).cut.lengthMm).toBeCloseTo(80, 9)
  })

  it('reads hexadecimal references, tabs and the predefined entities', () => {
    const result = analyze(mmDocument(`<path d="M10&#x20;10&#9;H50" fill="none" stroke="&#x23;c2185b"/>`, 100, 100))
    expect(result.cut.lengthMm).toBeCloseTo(40, 9)
  })
})

describe('units and percentages on shape attributes (SVG 1.1 §7.10, CSS Values 3 §6.2)', () => {
  it('reads mm and in on a rect in a px document as those lengths (10 × 20 mm: perimeter 60 mm)', () => {
    const result = analyze(pxDocument(cutShape('rect', 'x="10mm" y="1in" width="20mm" height="10mm"')))
    expect(result.bbox.x).toBeCloseTo(10, 9)
    expect(result.bbox.y).toBeCloseTo(25.4, 9)
    expect(result.bbox.width).toBeCloseTo(20, 9)
    expect(result.cut.lengthMm).toBeCloseTo(60, 9)
  })

  it('takes a unit as CSS px of user space, so a 1 mm user unit makes x="5mm" 5 × 96/25.4 mm', () => {
    const result = analyze(mmDocument(cutShape('line', 'x1="0" y1="1" x2="5mm" y2="1"'), 100, 100))
    expect(result.cut.lengthMm).toBeCloseTo((5 * 96) / 25.4, 9)
  })

  it('reads r="80%" as 80 % of the viewport\'s normalised diagonal √((w² + h²)/2)', () => {
    // Viewport 100 × 100 user units (1 mm): r = 0.8 · 100 = 80 mm; circumference 2πr, flattened within 0.01 mm chords.
    const result = analyze(mmDocument(cutShape('circle', 'cx="50%" cy="50%" r="80%"'), 100, 100))
    expect(Math.abs(result.cut.lengthMm - 2 * Math.PI * 80)).toBeLessThan(0.05)
    expect(result.bbox.x).toBeCloseTo(50 - 80, 6)
  })

  it('resolves percentages inside a nested viewport against its viewBox', () => {
    // Inside viewBox 0 0 10 10 (scale 10): r = 10 % of √((10² + 10²)/2) = 1 user unit = 10 mm, centred at 50 %.
    const result = analyze(mmDocument(`<svg viewBox="0 0 10 10">${cutShape('circle', 'cx="50%" cy="50%" r="10%"')}</svg>`, 100, 100))
    expect(Math.abs(result.cut.lengthMm - 2 * Math.PI * 10)).toBeLessThan(0.05)
    expect(result.bbox.x).toBeCloseTo(40, 6)
    expect(result.bbox.width).toBeCloseTo(20, 6)
  })

  it('takes percentages of rect sides and rounded corners from the viewport width and height', () => {
    // 200 × 100 viewport: width 50 % = 100, height 20 % = 20, rx 5 % = 10 (ry follows rx): perimeter 2(100 + 20) − 8·10 + 2π·10.
    const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="200mm" height="100mm" viewBox="0 0 200 100">${cutShape('rect', 'x="0" y="0" width="50%" height="20%" rx="5%"')}</svg>`
    expect(Math.abs(analyze(svg).cut.lengthMm - (2 * (100 + 20) - 8 * 10 + 2 * Math.PI * 10))).toBeLessThan(0.05)
  })
})

describe('a namespace-prefixed root (Namespaces in XML 1.0)', () => {
  it('reads <svg:svg> with svg:-prefixed shapes', () => {
    const svg = `<svg:svg xmlns:svg="http://www.w3.org/2000/svg" width="100mm" height="100mm" viewBox="0 0 100 100"><svg:g><svg:path d="M0 10H50" fill="none" stroke="${CUT}"/></svg:g></svg:svg>`
    expect(analyze(svg).cut.lengthMm).toBeCloseTo(50, 9)
  })

  it('leaves elements of another namespace undrawn', () => {
    const svg = `<svg:svg xmlns:svg="http://www.w3.org/2000/svg" xmlns:x="http://example.org/other" width="100mm" height="100mm" viewBox="0 0 100 100"><svg:path d="M0 10H50" fill="none" stroke="${CUT}"/><x:path d="M0 20H50" fill="none" stroke="${CUT}"/></svg:svg>`
    expect(analyze(svg).cut.lengthMm).toBeCloseTo(50, 9)
  })
})

describe('<title> and <desc> text that reads like an event handler', () => {
  // The upload screen judges parsed attributes, not text (server/utils/active-content.ts); the engine reads neither.
  const svg = mmDocument(`<title>Hinge onfold = 2 mm</title><desc>flap onclick = nothing, open = yes</desc>${cutPath('M0 10H50')}`, 100, 100)

  it('passes the upload screen', () => {
    expect(activeContentIn(svg, 'svg')).toEqual([])
  })

  it('is analysed like the same drawing without the text', () => {
    expect(analyze(svg).cut.lengthMm).toBeCloseTo(50, 9)
  })

  it('while a real on… attribute is still caught', () => {
    expect(activeContentIn(mmDocument(`<path d="M0 0H5" onclick="x()"/>`), 'svg')).toContain('an event handler (on… attribute)')
  })
})

describe('binary DXF', () => {
  // DXF reference, "Binary DXF Files": a 22-byte sentinel "AutoCAD Binary DXF" CR LF SUB NUL, then groups as
  // 2-byte little-endian codes and binary values. This one holds 0/SECTION 2/ENTITIES 0/ENDSEC 0/EOF, all text,
  // so it is valid UTF-8 and reaches the engine as text, as a small binary file can.
  const group = (code: number, value: string) => [code & 0xff, code >> 8, ...Buffer.from(`${value}\0`, 'latin1')]
  const bytes = Uint8Array.from([...Buffer.from('AutoCAD Binary DXF\r\n\x1a\0', 'latin1'), ...group(0, 'SECTION'), ...group(2, 'ENTITIES'), ...group(0, 'ENDSEC'), ...group(0, 'EOF')])
  const text = new TextDecoder('utf-8', { fatal: true }).decode(bytes)

  it('is refused with a message that asks for ASCII DXF, not for SVG', () => {
    let refusal: unknown
    try {
      analyzeCutFile(text, withDefaults())
    } catch (error) {
      refusal = error
    }
    expect(refusal).toBeInstanceOf(AnalysisInputError)
    expect((refusal as AnalysisInputError).message).toMatch(/binary DXF/)
    expect((refusal as AnalysisInputError).message).toMatch(/ASCII DXF/)
    expect((refusal as AnalysisInputError).message).not.toMatch(/Export the pattern as SVG/)
  })
})
