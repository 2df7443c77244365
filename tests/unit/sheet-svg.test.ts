import { Arc, Point, Polygon } from '@flatten-js/core'
import { Bezier } from 'bezier-js'
import svgpath from 'svgpath'
import { type INode, parseSync } from 'svgson'
import { describe, expect, it } from 'vitest'
import { analyzeCutFileWithGeometry, analyzeSvgWithGeometry, withDefaults, type AnalysisParams, type CutFileFormat } from '../../server/analysis/index'
import type { DrawnOperation } from '../../server/analysis/polylines'
import { arc, circle, dxfDocument } from '../analysis/dxf/dxfText'
import { drawnElementsOf, sheetSvgText, type SheetDrawing } from '../../server/analysis/sheetSvg'

const params: AnalysisParams = withDefaults({ sheetWidthMm: 600, sheetHeightMm: 400 })
const colourOf = (operation: DrawnOperation) => params.colourMapping.find((c) => c.operation === operation)!.hex
const [CUT, ENGRAVE] = [colourOf('cut'), colourOf('engrave')]

const RADIUS = 20
const ELEMENTS_PER_COPY = 4
const CURVE = [10.0000004, 100, 30, 80, 60, 120, 80, 100] as const
// A 30 × 10 area filled by the nonzero rule, and a 40 × 40 square with a 20 × 20 hole, both rings drawn the same way
// round, so only the even-odd rule makes the hole.
const RECT_AREA = 30 * 10
const FRAME_AREA = 40 * 40 - 20 * 20

/** Drawn in mm: a cut circle, an open cut curve starting at x = 10.0000004, an engraved rectangle and an even-odd frame. */
const original = `<svg xmlns="http://www.w3.org/2000/svg" width="200mm" height="200mm" viewBox="0 0 200 200">
<rect x="5" y="5" width="30" height="10" fill="${ENGRAVE}"/>
<circle cx="70" cy="40" r="${RADIUS}" fill="none" stroke="${CUT}"/>
<path d="M${CURVE[0]} ${CURVE[1]}C${CURVE.slice(2).join(' ')}" fill="none" stroke="${CUT}"/>
<path d="M100 5H140V45H100ZM110 15H130V35H110Z" fill="${ENGRAVE}" fill-rule="evenodd"/>
</svg>`

// The second copy is turned a quarter; its paths follow the first copy's.
const PLACEMENTS = [
  { fileId: 1, x: 10, y: 10, rotated: false },
  { fileId: 1, x: 300, y: 10, rotated: true },
]

function sheetOf(source: string, format: CutFileFormat = 'svg'): { text: string; originalAnalysis: ReturnType<typeof analyzeCutFileWithGeometry> } {
  const originalAnalysis = analyzeCutFileWithGeometry(source, params, { format })
  const { bbox } = originalAnalysis.result
  const drawing: SheetDrawing = {
    widthMm: 600,
    heightMm: 400,
    placements: PLACEMENTS,
    parts: new Map([[1, { bbox, elements: drawnElementsOf(source, format, params) }]]),
    colourOf,
  }
  return { text: sheetSvgText(drawing), originalAnalysis }
}

const paths = (root: INode): INode[] => (root.name === 'path' ? [root] : root.children.flatMap(paths))

/** Lengths and rings of path data, measured by packages outside the engine (svgpath only reads the grammar). */
function measure(d: string): { lengthMm: number; rings: Point[][] } {
  let lengthMm = 0
  const rings: Point[][] = []
  svgpath(d).abs().unshort().iterate((segment, _index, x, y) => {
    const [command, ...n] = segment as [string, ...number[]]
    const numbers = n.map(Number)
    const end = (to: Point) => {
      rings.at(-1)!.push(to)
      lengthMm += new Point(x, y).distanceTo(to)[0]
    }
    if (command === 'M') rings.push([new Point(numbers[0]!, numbers[1]!)])
    else if (command === 'L') end(new Point(numbers[0]!, numbers[1]!))
    else if (command === 'H') end(new Point(numbers[0]!, y))
    else if (command === 'V') end(new Point(x, numbers[0]!))
    else if (command === 'Z') end(rings.at(-1)![0]!)
    else if (command === 'C') {
      // bezier-js 6.1.4 measures a cubic by Legendre–Gauss quadrature.
      lengthMm += new Bezier(x, y, numbers[0]!, numbers[1]!, numbers[2]!, numbers[3]!, numbers[4]!, numbers[5]!).length()
      rings.at(-1)!.push(new Point(numbers[4]!, numbers[5]!))
    } else if (command === 'A') {
      const [rx, ry, , large, sweep, x2, y2] = numbers as [number, number, number, number, number, number, number]
      expect(rx).toBeCloseTo(ry, 9)
      // SVG 1.1 F.6.5, endpoint to centre parameterisation, for a circle (rx = ry, so the rotation drops out).
      const hx = (x - x2) / 2
      const hy = (y - y2) / 2
      const r = Math.max(rx, Math.hypot(hx, hy))
      const sign = large !== sweep ? 1 : -1
      const coefficient = sign * Math.sqrt(Math.max(0, (r * r - hx * hx - hy * hy) / (hx * hx + hy * hy)))
      const centre = new Point(coefficient * hy + (x + x2) / 2, -coefficient * hx + (y + y2) / 2)
      const angle = (px: number, py: number) => Math.atan2(py - centre.y, px - centre.x)
      // @flatten-js/core 1.6.15 measures the arc; sweep 1 runs the way the angle grows in SVG's frame.
      lengthMm += new Arc(centre, r, angle(x, y), angle(x2, y2), sweep === 1).length
      rings.at(-1)!.push(new Point(x2, y2))
    } else throw new Error(`Unexpected command ${command}`)
  })
  return { lengthMm, rings }
}

/**
 * The area a path paints, from its rings (@flatten-js/core 1.6.15 for each ring's area and containment): even-odd
 * paints where a point lies inside an odd number of rings (SVG 1.1 §11.3 'fill-rule'); nested rings that never cross
 * make that Σ (−1)^depth · |area|. Only single-ring paths are filled by the nonzero rule here.
 */
function paintedArea(rings: Point[][], fillRule: string): number {
  const polygons = rings.map((ring) => new Polygon(ring.map((p) => [p.x, p.y] as [number, number])))
  if (fillRule !== 'evenodd') expect(rings.length).toBe(1)
  return polygons.reduce((sum, polygon, i) => {
    const depth = polygons.filter((other, j) => j !== i && other.contains(rings[i]![0]!)).length
    return sum + (depth % 2 === 0 ? 1 : -1) * Math.abs(polygon.area())
  }, 0)
}

describe('the sheet SVG for the cutter', () => {
  const { text, originalAnalysis } = sheetOf(original)
  const copies = PLACEMENTS.length
  // Closed forms: a circle's circumference 2πr; the curve's length by bezier-js (it has no closed form).
  const expectedCutMm = 2 * Math.PI * RADIUS + new Bezier(...CURVE).length()
  const expectedAreaMm2 = RECT_AREA + FRAME_AREA

  it('the original itself measures as the closed forms say (the reference for what follows)', () => {
    expect(originalAnalysis.result.cut.lengthMm).toBeCloseTo(expectedCutMm, 6)
    expect(originalAnalysis.result.engrave.areaMm2).toBeCloseTo(expectedAreaMm2, 6)
  })

  it('re-read by the engine: the same cut length, contours and engrave area per copy as the original', () => {
    const sheet = analyzeSvgWithGeometry(text, params)
    expect(sheet.result.cut.lengthMm).toBeCloseTo(copies * expectedCutMm, 6)
    expect(sheet.result.cut.lengthMm).toBeCloseTo(copies * originalAnalysis.result.cut.lengthMm, 9)
    expect(sheet.geometry.contours.count).toBe(copies * originalAnalysis.geometry.contours.count)
    expect(sheet.result.cut.closedContours).toBe(copies * originalAnalysis.result.cut.closedContours)
    expect(sheet.result.engrave.areaMm2).toBeCloseTo(copies * expectedAreaMm2, 6)
  })

  it('read by svgson and measured by bezier-js and @flatten-js/core: strokes for cuts, fills for engraving', () => {
    const all = paths(parseSync(text))
    const strokes = all.filter((p) => p.attributes.fill === 'none')
    const fills = all.filter((p) => p.attributes.fill !== 'none')
    expect(strokes.length).toBe(2 * copies)
    expect(fills.length).toBe(2 * copies)
    for (const stroke of strokes) expect(stroke.attributes.stroke).toBe(CUT)
    for (const fill of fills) expect(fill.attributes).toMatchObject({ fill: ENGRAVE, stroke: 'none' })
    expect(fills.map((f) => f.attributes['fill-rule']).sort()).toEqual(['evenodd', 'evenodd', 'nonzero', 'nonzero'])

    const cutMm = strokes.reduce((sum, p) => sum + measure(p.attributes.d!).lengthMm, 0)
    expect(Math.abs(cutMm - copies * expectedCutMm)).toBeLessThan(1e-6)
    const contours = strokes.reduce((sum, p) => sum + measure(p.attributes.d!).rings.length, 0)
    expect(contours).toBe(copies * 2)
    const areaMm2 = fills.reduce((sum, p) => sum + paintedArea(measure(p.attributes.d!).rings, p.attributes['fill-rule']!), 0)
    expect(Math.abs(areaMm2 - copies * expectedAreaMm2)).toBeLessThan(1e-6)
  })

  it('keeps coordinates unrounded: the curve start at x = 10.0000004 mm lands 0.0000004 mm right of its rounded place', () => {
    const { bbox } = originalAnalysis.result
    const [placement] = PLACEMENTS
    const expected = { x: placement!.x + (CURVE[0] - bbox.x), y: placement!.y + (CURVE[1] - bbox.y) }
    const near = (x: number, y: number) => Math.abs(x - expected.x) < 1e-9 && Math.abs(y - expected.y) < 1e-9
    // Written in the file (svgson), and read back by the engine.
    const written = paths(parseSync(text)).flatMap((p) => measure(p.attributes.d!).rings.flat())
    expect(written.some((p) => near(p.x, p.y))).toBe(true)
    const { xy, pointCount } = analyzeSvgWithGeometry(text, params).geometry.contours
    expect(Array.from({ length: pointCount }, (_, i) => near(xy[2 * i]!, xy[2 * i + 1]!)).some(Boolean)).toBe(true)
    // Rounding to 1 µm would have moved it onto the whole millimetre.
    expect(Math.abs(expected.x - Math.round(expected.x * 1000) / 1000)).toBeGreaterThan(1e-7)
  })

  it('turns a copy a quarter within its place on the sheet, never mirrors it', () => {
    const all = paths(parseSync(text))
    const { bbox } = originalAnalysis.result
    const [, placement] = PLACEMENTS
    const rotated = all.slice(ELEMENTS_PER_COPY).flatMap((p) => measure(p.attributes.d!).rings.flat())
    for (const p of rotated) {
      expect(p.x).toBeGreaterThanOrEqual(placement!.x - 1e-9)
      expect(p.x).toBeLessThanOrEqual(placement!.x + bbox.height + 1e-9)
      expect(p.y).toBeGreaterThanOrEqual(placement!.y - 1e-9)
      expect(p.y).toBeLessThanOrEqual(placement!.y + bbox.width + 1e-9)
    }
    // The part's left edge runs along the bottom of its place, so the curve start sits its height above that bottom.
    const start = { x: placement!.x + (CURVE[1] - bbox.y), y: placement!.y + (bbox.x + bbox.width - CURVE[0]) }
    expect(rotated.some((p) => Math.abs(p.x - start.x) < 1e-9 && Math.abs(p.y - start.y) < 1e-9)).toBe(true)
    // A turn keeps the way round of every ring, a mirror reverses it: shoelace sign, ½Σ(xᵢyᵢ₊₁ − xᵢ₊₁yᵢ).
    const signedArea = (ring: Point[]) => ring.reduce((sum, p, i) => sum + p.x * ring[(i + 1) % ring.length]!.y - ring[(i + 1) % ring.length]!.x * p.y, 0) / 2
    const rectangle = (copy: number) => measure(all[copy * ELEMENTS_PER_COPY]!.attributes.d!).rings[0]!
    expect(Math.sign(signedArea(rectangle(1)))).toBe(Math.sign(signedArea(rectangle(0))))
  })
})

describe('the sheet SVG of a DXF part', () => {
  it('keeps circles and a mirrored arc as exact arcs: 2πr and r·θ, re-read by the engine and measured by @flatten-js/core', () => {
    // Extrusion (0, 0, −1): the arc's object coordinates are mirrored, so the reader's matrix mirrors its path data back.
    const dxf = dxfDocument({ insUnits: 4, entities: [...circle(50, 50, 15), ...arc(20, 20, 10, 0, 90, [[210, 0], [220, 0], [230, -1]])] })
    const expectedMm = 2 * Math.PI * 15 + 10 * (Math.PI / 2)
    const { text, originalAnalysis } = sheetOf(dxf, 'dxf')
    expect(originalAnalysis.result.cut.lengthMm).toBeCloseTo(expectedMm, 6)
    expect(analyzeSvgWithGeometry(text, params).result.cut.lengthMm).toBeCloseTo(PLACEMENTS.length * expectedMm, 6)
    const strokes = paths(parseSync(text))
    expect(strokes.every((p) => p.attributes.fill === 'none' && p.attributes.stroke === CUT)).toBe(true)
    expect(strokes.reduce((sum, p) => sum + measure(p.attributes.d!).lengthMm, 0)).toBeCloseTo(PLACEMENTS.length * expectedMm, 6)
  })
})
