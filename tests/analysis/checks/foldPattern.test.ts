import { describe, expect, it } from 'vitest'
import { analyzeSvg, withDefaults } from '../../../server/analysis/index'
import { mmDocument } from '../helpers'
import { sitesOf } from '../sites'
import { foldSheet } from './foldPattern'

const KERF_MM = 0.2
const MIN_BRIDGE_MM = 1
const params = withDefaults({ kerfMm: KERF_MM, minBridgeMm: MIN_BRIDGE_MM, sheetWidthMm: 3000, sheetHeightMm: 3000, bedWidthMm: 3000, bedHeightMm: 3000 })

// Gaps from 0.3 to 1.1 mm (webs 0.1 to 0.9 mm), with every fifth one 1.5 mm wide: a web of 1.3 mm, above the minimum.
const varyingGap = (row: number, gap: number) => ((row + gap) % 5 === 4 ? 1.5 : 0.3 + 0.05 * ((row * 7 + gap * 3) % 17))

describe('a generated fold pattern with pinch bridges of known width', () => {
  it('reports exactly one site per narrow pinch, at its place, with its width, narrowest first', () => {
    const sheet = foldSheet(6, 9, varyingGap, 0.7, [3, 2, 2.5, 4, 1.5, 6])
    const expected = sheet.bridges.map((bridge) => ({ ...bridge, webMm: bridge.gapMm - KERF_MM })).filter((bridge) => bridge.webMm < MIN_BRIDGE_MM)
    const sites = sitesOf(analyzeSvg(mmDocument(sheet.svgBody, 3000, 3000), params), 'narrow-bridge')
    expect(sites).toHaveLength(expected.length)
    for (const bridge of expected) {
      const site = sites.find((candidate) => Math.hypot(candidate.x - bridge.x, candidate.y - bridge.y) < 0.01)
      expect(site, `pinch at ${bridge.x}, ${bridge.y}`).toBeDefined()
      expect(site!.valueMm).toBeCloseTo(bridge.webMm, 2)
      expect(new Set(site!.contours).size).toBe(2)
    }
    const widths = sites.map((site) => site.valueMm!)
    expect(widths).toEqual([...widths].sort((a, b) => a - b))
  })

  it('gives one group of 400 sites for 400 identical pinch bridges, with the summary count', () => {
    // 20 rows of 10 slits: 20 × 9 straight pinches + 20 × 10 T-pinches + 20 ring gaps = 400.
    const sheet = foldSheet(20, 9, () => 0.8, 0.8, Array(20).fill(2 * (180 / Math.PI) * Math.asin(0.8 / 40)))
    expect(sheet.bridges).toHaveLength(400)
    const result = analyzeSvg(mmDocument(sheet.svgBody, 3000, 3000), params)
    const sites = sitesOf(result, 'narrow-bridge')
    expect(sites).toHaveLength(400)
    for (const site of sites) expect(site.valueMm).toBeCloseTo(0.6, 2)
    expect(result.checks.narrowBridgeSites).toBe(400)
    expect(result.findingGroups.filter((group) => group.code === 'narrow-bridge')).toMatchObject([{ key: 'narrow-bridge:between-cuts:1', count: 400 }])
  })
})
