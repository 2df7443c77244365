import { describe, expect, it } from 'vitest'
import { decodeGeometry, decodeSites, encodeGeometry, encodeSites } from '../../shared/packed-analysis'
import { analyzeCutFileWithGeometry, withDefaults } from '../../server/analysis/index'
import { circle, dxfDocument, line } from './dxf/dxfText'
import { cutPath, mmDocument } from './helpers'

const params = withDefaults({ kerfMm: 0.2, minBridgeMm: 1 })

describe('analyzeCutFileWithGeometry, as the analysis worker calls it', () => {
  it('gives the result and the contours the sites point into, for SVG and DXF alike, and both pack and unpack unchanged', () => {
    const svg = mmDocument(['M10 10H60', 'M10 11H60', 'M80 80h0.1'].map((d) => cutPath(d)).join(''))
    // Units code 4: millimetres.
    const dxf = dxfDocument({ insUnits: 4, entities: [...line(10, 10, 60, 10), ...line(10, 11, 60, 11), ...circle(100, 100, 0.5)] })
    for (const text of [svg, dxf]) {
      const { result, geometry } = analyzeCutFileWithGeometry(text, params)
      expect(geometry.contours.count).toBe(result.cut.pierces)
      expect(result.sites.count).toBeGreaterThan(0)
      for (let row = 0; row < result.sites.count; row++) {
        expect(result.sites.contourA[row]).toBeLessThan(geometry.contours.count)
        expect(result.sites.contourB[row]).toBeLessThan(geometry.contours.count)
      }
      expect(decodeSites(encodeSites(result.sites))).toEqual(result.sites)
      const packed = decodeGeometry(encodeGeometry(geometry.contours))
      expect(packed.count).toBe(geometry.contours.count)
      expect(Array.from(packed.start)).toEqual(Array.from(geometry.contours.start.subarray(0, geometry.contours.count + 1)))
    }
  })
})
