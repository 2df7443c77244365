import { equalIntervalBreaks, max, median, min } from 'simple-statistics'
import { describe, expect, it } from 'vitest'
import { analyzeSvg, type FindingStats, withDefaults } from '../../server/analysis/index'
import { findingStats } from '../../server/analysis/findings'
import { seededRandom } from '../../scripts/lib/seeded-random'
import { foldSheet } from './checks/foldPattern'
import { mmDocument } from './helpers'
import { sitesOf } from './sites'

// Reference: simple-statistics 7.12.1 — min, max, median (the mean of the middle two of an even count) and
// equalIntervalBreaks for the edges of ten equal-width bins; a value belongs to the bin whose lower edge it
// reaches, the top one includes the maximum. Equal values make one bin (the project's rule).
function reference(values: number[]): FindingStats {
  const low = min(values)
  const high = max(values)
  const edges = high > low ? equalIntervalBreaks(values, 10) : [low, high]
  const bins = edges.length - 1
  const counts = new Array<number>(bins).fill(0)
  for (const value of values) {
    let bin = 0
    while (bin < bins - 1 && value >= edges[bin + 1]!) bin++
    counts[bin]!++
  }
  return { min: low, median: median(values), max: high, histogram: { fromMm: low, toMm: high, counts } }
}

/** Equal to the reference; the median to 1e-12 (the reference interpolates a + ½(b − a), we take (a + b)/2). */
function expectAgrees(stats: FindingStats | null, values: number[], label: string): void {
  const expected = reference(values)
  expect(stats, label).toEqual({ ...expected, median: expect.closeTo(expected.median, 12) })
}

describe('statistics of a group against simple-statistics', () => {
  it('agrees on random sets: odd and even counts, one value, equal values, repeats on bin edges, negative webs', () => {
    const random = seededRandom(7)
    const sets: number[][] = [[0.5], [0.5, 0.5, 0.5], [2, 1], [0.3, -0.1, 0.7]]
    for (const size of [2, 3, 10, 11, 99, 1000, 25000]) {
      sets.push(Array.from({ length: size }, () => random() * 3 - 0.2))
      // Values on a 0.05 mm grid: many land exactly on bin edges.
      sets.push(Array.from({ length: size }, () => Math.round(random() * 20) * 0.05))
      // As the site table stores them: 32-bit floats.
      sets.push(Array.from({ length: size }, () => Math.fround(1.2 + random() * 0.3)))
    }
    for (const values of sets) expectAgrees(findingStats(Float64Array.from(values)), values, `${values.length} values`)
  })

  it('agrees on the sites the engine reports: a fold sheet of varied pinch bridges, and one of identical ones', () => {
    const params = withDefaults({ kerfMm: 0.2, minBridgeMm: 1, sheetWidthMm: 3000, sheetHeightMm: 3000, bedWidthMm: 3000, bedHeightMm: 3000 })
    const varied = foldSheet(12, 9, (row, gap) => 0.25 + 0.05 * ((row * 7 + gap * 3) % 19), 0.7, [3, 2, 2.5, 4, 1.5, 6])
    const identical = foldSheet(20, 9, () => 0.8, 0.8, [])
    for (const sheet of [varied, identical]) {
      const result = analyzeSvg(mmDocument(sheet.svgBody, 3000, 3000), params)
      const measured = result.findingGroups.filter((group) => group.stats !== null)
      expect(measured.length).toBeGreaterThan(0)
      for (const group of measured) {
        const values = sitesOf(result).filter((site) => site.key === group.key).map((site) => site.valueMm!)
        expect(values).toHaveLength(group.count)
        expectAgrees(group.stats, values, group.key)
      }
    }
  })
})
