import { describe, it } from 'vitest'
import { analyzeDxf, withDefaults } from '../../../server/analysis/index'
import { expectRefused } from '../helpers'
import { dxfDocument, type Group, insert, line } from './dxfText'

// As tests/analysis/robustness.test.ts does for SVG: a typed, member-readable error, and no hang.
function expectInputError(dxfText: string, kind: string, status: number): void {
  expectRefused(() => analyzeDxf(dxfText, withDefaults()), kind, status)
}

const valid = dxfDocument({ insUnits: 4, entities: line(0, 0, 10, 0) })

describe('bad DXF gets a typed error in bounded time', () => {
  it('refuses text that is not DXF with 415', () => {
    expectInputError('hello, this is a text file', 'notSvg', 415)
    expectInputError('<svg xmlns="http://www.w3.org/2000/svg"/>', 'notSvg', 415)
  })

  it('refuses a truncated file', () => {
    expectInputError(valid.slice(0, Math.floor(valid.length / 2)), 'malformedXml', 422)
    expectInputError(valid.replace(/0\nEOF\n$/, ''), 'malformedXml', 422)
  })

  it('refuses lines that are not group codes or numbers', () => {
    expectInputError(valid.replace('\n10\n0\n', '\n10\nzero\n'), 'badNumber', 422)
    expectInputError(valid.replace('\n11\n', '\neleven\n'), 'malformedXml', 422)
  })

  it('refuses huge numbers', () => {
    expectInputError(valid.replace('\n11\n10\n', '\n11\n1e999\n'), 'outOfRange', 422)
    expectInputError(dxfDocument({ insUnits: 4, entities: line(0, 0, 1e300, 0) }), 'outOfRange', 422)
    expectInputError(dxfDocument({ insUnits: 4, blocks: { B: line(0, 0, 1, 0) }, entities: insert('B', 0, 0, { scaleX: 1e300 }) }), 'outOfRange', 422)
  })

  it('refuses blocks that insert themselves, directly or in a ring, and nesting deeper than 32', () => {
    expectInputError(dxfDocument({ insUnits: 4, blocks: { LOOP: [...line(0, 0, 1, 0), ...insert('LOOP', 1, 0)] }, entities: insert('LOOP', 0, 0) }), 'tooComplex', 422)
    expectInputError(dxfDocument({ insUnits: 4, blocks: { A: insert('B', 0, 0), B: insert('A', 0, 0) }, entities: insert('A', 0, 0) }), 'tooComplex', 422)
    const levels = Object.fromEntries(Array.from({ length: 40 }, (_, level) => [`L${level}`, level === 0 ? line(0, 0, 1, 0) : insert(`L${level - 1}`, 0, 0)]))
    expectInputError(dxfDocument({ insUnits: 4, blocks: levels, entities: insert('L39', 0, 0) }), 'tooComplex', 422)
  })

  it('refuses blocks that multiply into millions of entities', () => {
    const fan = (name: string): Group[] => Array.from({ length: 200 }, (_, index) => insert(name, index, 0)).flat()
    expectInputError(dxfDocument({ insUnits: 4, blocks: { A: line(0, 0, 1, 0), B: fan('A'), C: fan('B') }, entities: fan('C') }), 'tooComplex', 422)
  })

  it('refuses the malformed structures on which dxf-parser 1.1.2 would never return', () => {
    // A layer table holding something other than layers; a POLYLINE with no SEQEND; an LWPOLYLINE announcing vertices it lacks.
    expectInputError(valid.replace('0\nENDTAB', '0\nLINE\n0\nENDTAB'), 'malformedXml', 422)
    expectInputError(dxfDocument({ entities: [[0, 'POLYLINE'], [8, '0'], [66, 1], [70, 0], ...line(0, 0, 1, 0)] }), 'malformedXml', 422)
    expectInputError(dxfDocument({ entities: [[0, 'LWPOLYLINE'], [8, '0'], [90, 2_000_000_000], [70, 0], [10, 0], [20, 0]] }), 'malformedXml', 422)
  })

  it('refuses units no cutter works in', () => {
    expectInputError(dxfDocument({ insUnits: 3, entities: line(0, 0, 1, 0) }), 'badUnit', 422)
  })
})
