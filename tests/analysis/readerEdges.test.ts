import { describe, expect, it } from 'vitest'
import { AnalysisInputError, analyzeDxf, withDefaults } from '../../server/analysis/index'
import { dxfDocument, type Group, line } from './dxf/dxfText'
import { analyze, cutPath, mmDocument } from './helpers'
import { groupOf } from './sites'

const WHITE_CUTS = withDefaults({ colourMapping: [{ hex: '#ffffff', toleranceRgbDistance: 0, operation: 'cut' }] })
const analyseDxf = (entities: Group[]) => analyzeDxf(dxfDocument({ insUnits: 4, entities }), WHITE_CUTS)

function refusal(analyse: () => unknown): AnalysisInputError {
  try {
    analyse()
  } catch (error) {
    if (error instanceof AnalysisInputError) return error
    throw error
  }
  throw new Error('not refused')
}

describe('display="none" on the root (SVG 1.1 §11.5: the element and its children are not rendered)', () => {
  for (const attribute of ['display="none"', 'style="display:none"']) {
    it(`draws nothing of <svg ${attribute}>`, () => {
      const svg = mmDocument(cutPath('M0 0H50')).replace('<svg ', `<svg ${attribute} `)
      expect(refusal(() => analyze(svg)).kind).toBe('empty')
    })
  }

  it('still draws a root with display="inline"', () => {
    expect(analyze(mmDocument(cutPath('M0 0H50')).replace('<svg ', '<svg display="inline" ')).cut.lengthMm).toBeCloseTo(50, 9)
  })
})

// DXF reference, Object Coordinate Systems: LINE and 3D POLYLINE points are world coordinates, so differing Z puts them out of the drawing plane.
const vertex = (x: number, y: number, z: number): Group[] => [[0, 'VERTEX'], [8, '0'], [10, x], [20, y], [30, z], [70, 32]]
const polyline3d = (points: Array<[number, number, number]>): Group[] => [[0, 'POLYLINE'], [8, '0'], [66, 1], [10, 0], [20, 0], [30, 0], [70, 8], ...points.flatMap(([x, y, z]) => vertex(x, y, z)), [0, 'SEQEND'], [8, '0']]
const TILTED: Group[] = [[210, 0.6], [220, 0], [230, 0.8]]

describe('tilted geometry in DXF', () => {
  it('reports a 3D POLYLINE whose vertices leave the drawing plane instead of cutting its shortened projection', () => {
    const result = analyseDxf([...polyline3d([[0, 0, 0], [10, 0, 5], [10, 10, 10]]), ...line(0, 20, 10, 20)])
    expect(result.cut.lengthMm).toBeCloseTo(10, 9)
    expect(groupOf(result, 'dxf-not-planar')).toMatchObject({ count: 1 })
  })

  it('reports a LINE whose ends differ in Z, and cuts one at a constant height', () => {
    const tilted: Group[] = [[0, 'LINE'], [8, '0'], [10, 0], [20, 0], [30, 0], [11, 10], [21, 0], [31, 10]]
    const flat: Group[] = [[0, 'LINE'], [8, '0'], [10, 0], [20, 5], [30, 3], [11, 10], [21, 5], [31, 3]]
    const result = analyseDxf([...tilted, ...flat])
    expect(result.cut.lengthMm).toBeCloseTo(10, 9)
    expect(groupOf(result, 'dxf-not-planar')).toMatchObject({ count: 1 })
  })

  it('cuts a 3D POLYLINE lying flat at any one height', () => {
    const result = analyseDxf(polyline3d([[0, 0, 7], [10, 0, 7], [10, 10, 7]]))
    expect(result.cut.lengthMm).toBeCloseTo(20, 9)
  })

  it('tells a drawing of only tilted lines what to do, not that it holds text or images', () => {
    const polyline2dTilted: Group[] = [[0, 'POLYLINE'], [8, '0'], [66, 1], [10, 0], [20, 0], [30, 0], [70, 0], ...TILTED, ...vertex(0, 0, 0), ...vertex(10, 0, 0), [0, 'SEQEND'], [8, '0']]
    for (const entities of [polyline3d([[0, 0, 0], [10, 0, 5]]), polyline2dTilted]) {
      const { kind, message } = refusal(() => analyseDxf(entities))
      expect(kind).toBe('empty')
      expect(message).toMatch(/tilted out of the drawing plane/)
      expect(message).not.toMatch(/text or images/)
    }
  })

  it('still names text when a drawing holds only text', () => {
    const text: Group[] = [[0, 'TEXT'], [8, '0'], [10, 0], [20, 0], [30, 0], [40, 5], [1, 'hello']]
    expect(refusal(() => analyseDxf(text)).message).toMatch(/text or images/)
  })
})
