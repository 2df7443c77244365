import { describe, expect, it } from 'vitest'
import { sitesOf } from '../sites'
import { analyse, circlePath, rectanglePath, SHEET_OUTLINE } from './helpers'

describe('checks in the engine result', () => {
  it('lists errors first, then warnings, then notes, and adds the summary', () => {
    const { result } = analyse([SHEET_OUTLINE, 'M10 10H60', 'M10 11H60', 'M10 30H60', 'M10 30.1H60', rectanglePath(100, 100, 20, 20), rectanglePath(110, 110, 20, 20), circlePath(150, 50, 0.5)])
    const severities = result.findingGroups.map((group) => group.severity)
    expect(severities).toEqual([...severities].sort((a, b) => ['error', 'warning', 'info'].indexOf(a) - ['error', 'warning', 'info'].indexOf(b)))
    expect(new Set(result.findingGroups.map((group) => group.code))).toEqual(new Set(['narrow-bridge', 'merged-cuts', 'small-hole', 'open-contour']))
    expect(result.checks).toMatchObject({ narrowBridgeSites: 2, duplicateCutLengthMm: 0, duplicateCutTimeS: 0 })
    expect(result.checks.narrowestBridgeMm).toBeCloseTo(0.1 - 0.2, 9)
    // The site table holds the groups' sites one after another, in the groups' order.
    expect(result.findingGroups.map((group) => group.firstSite)).toEqual(
      result.findingGroups.map((_, index) => result.findingGroups.slice(0, index).reduce((sum, group) => sum + group.count, 0)),
    )
    expect(result.sites.count).toBe(sitesOf(result).length)
  })

  it('groups sites by code, severity, cause and limit, with their count, statistics and box', () => {
    // Three slit pairs 1.0, 1.1 and 1.2 mm apart: webs 0.8, 0.9, 1.0 mm under a 1.5 mm minimum.
    const limits = { kerfMm: 0.2, minBridgeMm: 1.5 }
    const { result } = analyse(['M10 10H60', 'M10 11H60', 'M10 30H60', 'M10 31.1H60', 'M10 50H60', 'M10 51.2H60'], limits)
    const between = result.findingGroups.find((group) => group.key === 'narrow-bridge:between-cuts:1.5')!
    expect(between).toMatchObject({ code: 'narrow-bridge', severity: 'warning', cause: 'between-cuts', count: 3, facts: { limitMm: 1.5, kerfMm: 0.2 } })
    // Statistics of the values as stored (32-bit floats).
    expect(between.stats!.min).toBeCloseTo(0.8, 6)
    expect(between.stats!.median).toBeCloseTo(0.9, 6)
    expect(between.stats!.max).toBeCloseTo(1.0, 6)
    expect(between.box[1]).toBeCloseTo(10.5, 5)
    expect(between.box[3]).toBeCloseTo(50.6, 5)
    expect(sitesOf(result, 'narrow-bridge').filter((site) => site.cause === 'between-cuts').map((site) => site.valueMm)).toEqual([expect.closeTo(0.8, 6), expect.closeTo(0.9, 6), expect.closeTo(1.0, 6)])
    expect(result.findingGroups.find((group) => group.key === 'open-contour:slit:')).toMatchObject({ count: 6, stats: null })
    // A neck of one outline is another cause, so another group.
    const neck = analyse(['M0 0H20V9.5H25V0H45V20H25V10.5H20V20H0Z'], limits).result
    expect(neck.findingGroups.map((group) => group.key)).toEqual(['narrow-bridge:neck:1.5'])
  })
})
