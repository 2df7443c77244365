import DxfParser from 'dxf-parser'
import Drawing, { type Point2D } from 'dxf-writer'
import { describe, expect, it } from 'vitest'
import { ACI_RGB } from '../../../server/analysis/dxf/aciColours'
import { analyzeCutFile, analyzeDxf, analyzeSvg, withDefaults } from '../../../server/analysis/index'
import { CUT, cutPath, mmDocument } from '../helpers'
import { groupOf, sitesOf } from '../sites'
import { circle, dxfDocument, type Group, insert, line, lwPolyline } from './dxfText'

const MM = 4
const params = withDefaults()

describe('the same part in SVG and DXF', () => {
  it('gives the same length, pierces and bounding box (±0.01 mm), with DXF (x, y) at (x, −y)', () => {
    // A 60 × 40 plate with rounded corners (r 5), a Ø10 hole and a 20 mm slot, drawn in DXF below the X axis (Y up) …
    const plate = lwPolyline(
      [
        [5, -40],
        [55, -40, Math.tan(Math.PI / 8)],
        [60, -35],
        [60, -5, Math.tan(Math.PI / 8)],
        [55, 0],
        [5, 0, Math.tan(Math.PI / 8)],
        [0, -5],
        [0, -35, Math.tan(Math.PI / 8)],
      ],
      true,
    )
    const dxf = dxfDocument({ insUnits: MM, entities: [...plate, ...circle(15, -20, 5), ...line(30, -20, 50, -20)] })
    // … and in SVG (Y down) at the mirrored place.
    const svg = mmDocument(`${cutPath('M5 40H55A5 5 0 0 0 60 35V5A5 5 0 0 0 55 0H5A5 5 0 0 0 0 5V35A5 5 0 0 0 5 40Z')}<circle cx="15" cy="20" r="5" fill="none" stroke="${CUT}"/>${cutPath('M30 20H50')}`, 100, 100)
    const fromDxf = analyzeDxf(dxf, withDefaults({ colourMapping: [{ hex: '#ffffff', toleranceRgbDistance: 0, operation: 'cut' }] }))
    const fromSvg = analyzeSvg(svg, params)
    expect(Math.abs(fromDxf.cut.lengthMm - fromSvg.cut.lengthMm)).toBeLessThan(0.01)
    expect(fromDxf.cut.pierces).toBe(fromSvg.cut.pierces)
    expect(fromDxf.cut.closedContours).toBe(2)
    for (const key of ['x', 'y', 'width', 'height'] as const) expect(Math.abs(fromDxf.bbox[key] - fromSvg.bbox[key])).toBeLessThan(0.01)
  })
})

describe('$INSUNITS against the exact inch (1 in = 25.4 mm, international yard and pound agreement, 1959)', () => {
  const unitSquare = (insUnits: number | undefined) =>
    analyzeDxf(
      dxfDocument({
        insUnits,
        entities: lwPolyline(
          [
            [0, 0],
            [1, 0],
            [1, 1],
            [0, 1],
          ],
          true,
        ),
      }),
      params,
    )
  it.each([[1, 25.4], [4, 1], [5, 10], [6, 1000], [2, 304.8]])('code %d: one unit is %d mm', (code, mmPerUnit) => {
    const result = unitSquare(code)
    expect(result.cut.lengthMm).toBeCloseTo(4 * mmPerUnit, 9)
    expect(groupOf(result, 'dxf-units-assumed')).toBeUndefined()
  })
  it('unitless or unset reads as mm and says so', () => {
    for (const result of [unitSquare(0), unitSquare(undefined)]) {
      expect(result.cut.lengthMm).toBeCloseTo(4, 9)
      expect(groupOf(result, 'dxf-units-assumed')).toMatchObject({ severity: 'warning', count: 1 })
    }
  })
})

describe('blocks, layers, colours and what is not cut', () => {
  it('INSERT applies base point, scale, rotation and position, nested (DXF reference, INSERT, from memory)', () => {
    const blocks = { UNIT: line(0, 0, 10, 0), PAIR: [...insert('UNIT', 0, 0), ...insert('UNIT', 0, 5, { rotationDeg: 90 })] }
    const result = analyzeDxf(dxfDocument({ insUnits: MM, blocks, entities: insert('PAIR', 100, 50, { scaleX: 2, scaleY: 2 }) }), params)
    // Two 20 mm lines: (100,50)–(120,50) and, turned 90°, (100,60)–(100,80).
    expect(result.cut.lengthMm).toBeCloseTo(40, 9)
    expect(result.bbox).toMatchObject({ x: 100, width: 20 })
    expect(result.bbox.y).toBeCloseTo(-80, 9)
    expect(result.bbox.height).toBeCloseTo(30, 9)
  })

  it('entities on frozen or off layers are not cut; layer 0 in a block takes the insert’s layer', () => {
    const layers = [{ name: 'FROZEN', frozen: true }, { name: 'OFF', colour: -7 }, { name: 'SHOWN' }]
    const entities = [...line(0, 0, 10, 0, [[8, 'FROZEN']]), ...line(0, 0, 20, 0, [[8, 'OFF']]), ...line(0, 0, 30, 0, [[8, 'SHOWN']]), ...insert('B', 0, 0, { layer: 'OFF' }), ...insert('B', 0, 0, { layer: 'FROZEN' })]
    const result = analyzeDxf(dxfDocument({ insUnits: MM, layers, blocks: { B: line(0, 5, 40, 5) }, entities: entities.map(([code, value]) => [code, code === 8 && value === '0' ? 'SHOWN' : value] as Group) }), params)
    expect(result.cut.lengthMm).toBeCloseTo(30, 9)
  })

  it('maps operations by layer name first, then by ACI or true colour through the colour mapping', () => {
    const layers = [{ name: 'Score-lines', colour: 1 }]
    const entities = [...line(0, 0, 10, 0, [[8, 'SCORE-LINES']]), ...line(0, 10, 20, 10, [[62, 1]]), ...line(0, 20, 30, 20, [[62, 7], [420, 0x00897b]])]
    const mapped = withDefaults({ dxfLayerMapping: [{ layer: 'score-lines', operation: 'score' }], colourMapping: [{ hex: '#ff0000', toleranceRgbDistance: 0, operation: 'cut' }, { hex: '#00897b', toleranceRgbDistance: 0, operation: 'score' }] })
    const result = analyzeDxf(dxfDocument({ insUnits: MM, layers, entities }), mapped)
    expect(result.score.lengthMm).toBeCloseTo(40, 9)
    expect(result.cut.lengthMm).toBeCloseTo(20, 9)
    expect(groupOf(result, 'unmapped-colour')).toBeUndefined()
  })

  it('TEXT, MTEXT, DIMENSION, HATCH and IMAGE become findings, not cuts', () => {
    const entities: Group[] = [
      ...circle(0, 0, 10),
      [0, 'TEXT'], [8, '0'], [10, 1], [20, 2], [30, 0], [40, 3], [1, 'PART A'],
      [0, 'MTEXT'], [8, '0'], [10, 1], [20, 2], [30, 0], [40, 3], [1, 'note'],
      [0, 'DIMENSION'], [8, '0'], [2, '*D1'], [10, 0], [20, 0], [30, 0], [70, 0],
      [0, 'HATCH'], [8, '0'], [10, 0], [20, 0], [30, 0], [2, 'SOLID'], [70, 1],
      [0, 'IMAGE'], [8, '0'], [10, 5], [20, 5], [30, 0],
    ]
    const result = analyzeDxf(dxfDocument({ insUnits: MM, entities }), params)
    expect(Math.abs(result.cut.lengthMm / (2 * Math.PI * 10) - 1)).toBeLessThan(1e-5)
    const codes = result.findingGroups.map((group) => group.code)
    for (const code of ['text-not-outlined', 'dxf-dimension', 'dxf-hatch', 'raster-image']) expect(codes).toContain(code)
    // TEXT and MTEXT: one group, a site each.
    expect(groupOf(result, 'text-not-outlined')).toMatchObject({ count: 2, facts: { format: 'dxf' } })
    expect(sitesOf(result, 'raster-image')).toMatchObject([{ x: 5, y: -5 }])
  })

  it('every ACI colour matches the one dxf-parser itself gives an entity', () => {
    const entities = Array.from({ length: 255 }, (_, index) => line(0, 0, 1, 0, [[62, index + 1]])).flat()
    const parsed = new DxfParser().parseSync(dxfDocument({ insUnits: MM, entities }))!
    expect(parsed.entities.map((entity) => entity.color)).toEqual(ACI_RGB.slice(1, 256))
  })

  it('detects the format by content', () => {
    expect(analyzeCutFile(dxfDocument({ insUnits: MM, entities: line(0, 0, 7, 0) }), params).cut.lengthMm).toBeCloseTo(7, 9)
    expect(analyzeCutFile(mmDocument(cutPath('M0 0H7')), params).cut.lengthMm).toBeCloseTo(7, 9)
  })
})

describe('a DXF written by an independent writer (dxf-writer 1.18.4) round-trips', () => {
  it('lines, a circle, an arc and a polyline with a bulge measure as drawn, in inches', () => {
    const drawing = new Drawing()
    drawing.setUnits('Inches')
    drawing.drawLine(0, 0, 4, 0)
    drawing.drawCircle(2, 2, 0.5)
    drawing.drawArc(0, 0, 1, 0, 90)
    // dxf-writer reads a third number as the bulge (its Polyline.js says so), though its types allow only [x, y].
    drawing.drawPolyline([[0, 3, 1], [2, 3]] as unknown as Point2D[], false)
    const result = analyzeDxf(drawing.toDxfString(), params)
    const inches = 4 + 2 * Math.PI * 0.5 + Math.PI / 2 + Math.PI
    expect(Math.abs(result.cut.lengthMm / (inches * 25.4) - 1)).toBeLessThan(1e-5)
    // Four separate contours: the arc and the line meet nowhere.
    expect(result.cut.pierces).toBe(4)
  })
})
