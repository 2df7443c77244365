import Flatten from '@flatten-js/core'
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import type { FindingGroup, FindingSites, Severity } from '../../shared/finding-groups'
import { buildSiteIndex, clusterSites, rowOf, selectionOfRow, SEVERITY_RANK } from '../../utils/preview/clustering'
import { fitBox, visibleBox } from '../../utils/preview/viewport'

// Reference: @flatten-js/core 1.6.15 (an independent plane geometry library) decides which sites lie in
// view (Box.contains on its Points); the rest are counts checked against brute force over every site.
function groupsOf(sizes: { severity: Severity; count: number }[]): FindingGroup[] {
  let first = 0
  return sizes.map(({ severity, count }, i) => {
    const group: FindingGroup = { key: `g${i}`, code: 'narrow-bridge', severity, cause: '', count, facts: {}, stats: null, box: [0, 0, 0, 0], firstSite: first }
    first += count
    return group
  })
}

function sitesOf(points: [number, number][]): FindingSites {
  const n = points.length
  return {
    count: n,
    xy: Float32Array.from(points.flat()),
    value: new Float32Array(n),
    contourA: new Int32Array(n).fill(-1),
    contourB: new Int32Array(n).fill(-1),
  }
}

const severity = fc.constantFrom<Severity>('error', 'warning', 'info')
const scenario = fc
  .array(fc.record({ severity, count: fc.integer({ min: 1, max: 40 }) }), { minLength: 1, maxLength: 6 })
  .chain((sizes) => {
    const total = sizes.reduce((sum, s) => sum + s.count, 0)
    const coordinate = fc.double({ min: 0, max: 300, noNaN: true }).map(Math.fround)
    return fc.tuple(fc.constant(sizes), fc.array(fc.tuple(coordinate, coordinate), { minLength: total, maxLength: total }))
  })

describe('marker clustering', () => {
  it('counts every site in view exactly once, each cluster within one grid cell, with its worst severity', () => {
    fc.assert(
      fc.property(scenario, fc.double({ min: 0.5, max: 60, noNaN: true }), fc.integer({ min: 10, max: 80 }), ([sizes, points], zoom, cellPx) => {
        const groups = groupsOf(sizes)
        const sites = sitesOf(points)
        const index = buildSiteIndex(groups, sites)
        const screen = { width: 640, height: 400 }
        const fitted = fitBox([0, 0, 300, 300], screen)
        const view = { ...fitted, scale: fitted.scale * zoom }
        const visible = visibleBox(view, screen)
        const clusters = clusterSites(index, sites, view, visible, cellPx)
        const referenceView = new Flatten.Box(...visible)
        const inView = points.filter(([x, y]) => referenceView.contains(new Flatten.Point(x, y)))
        expect(clusters.reduce((sum, c) => sum + c.count, 0)).toBe(inView.length)
        for (const c of clusters) {
          // The box round a cluster's sites spans less than one cell on screen.
          expect((c.box[2] - c.box[0]) * view.scale).toBeLessThan(cellPx + 1e-6)
          expect((c.box[3] - c.box[1]) * view.scale).toBeLessThan(cellPx + 1e-6)
          const members = inView.filter(([x, y]) => x >= c.box[0] && x <= c.box[2] && y >= c.box[1] && y <= c.box[3])
          expect(members.length).toBeGreaterThanOrEqual(c.count)
          const group = groups[index.groupOfRow[c.row]!]!
          expect(SEVERITY_RANK[group.severity]).toBe(c.rank)
        }
        const worstInView = Math.min(...points.map(([x, y], row) => (referenceView.contains(new Flatten.Point(x, y)) ? index.rankOfRow[row]! : 9)))
        if (clusters.length) expect(Math.min(...clusters.map((c) => c.rank))).toBe(worstInView)
      }),
    )
  })

  it('separates sites into single markers once they are a cell apart on screen', () => {
    const points: [number, number][] = Array.from({ length: 25 }, (_, i) => [(i % 5) * 2, Math.floor(i / 5) * 2])
    const groups = groupsOf([{ severity: 'warning', count: 25 }])
    const sites = sitesOf(points)
    const index = buildSiteIndex(groups, sites)
    const screen = { width: 800, height: 600 }
    const far = fitBox([-200, -200, 200, 200], screen)
    const near = fitBox([-1, -1, 9, 9], screen)
    const clustered = clusterSites(index, sites, far, visibleBox(far, screen), 44)
    expect(clustered).toHaveLength(1)
    expect(clustered[0]!.count).toBe(25)
    const apart = clusterSites(index, sites, near, visibleBox(near, screen), 44)
    expect(apart).toHaveLength(25)
    expect(apart.every((c) => c.count === 1)).toBe(true)
  })

  it('leaves the selected site out of the clusters and maps rows to selections and back', () => {
    const groups = groupsOf([{ severity: 'error', count: 3 }, { severity: 'info', count: 2 }])
    const sites = sitesOf([[1, 1], [2, 2], [3, 3], [4, 4], [5, 5]])
    const index = buildSiteIndex(groups, sites)
    const screen = { width: 400, height: 400 }
    const view = fitBox([0, 0, 6, 6], screen)
    const clusters = clusterSites(index, sites, view, visibleBox(view, screen), 10, 3)
    expect(clusters.map((c) => c.row).sort()).toEqual([0, 1, 2, 4])
    expect(selectionOfRow(index, groups, 3)).toEqual({ group: 1, site: 0 })
    expect(rowOf(groups, { group: 1, site: 1 })).toBe(4)
    expect(rowOf(groups, { group: 1, site: 2 })).toBe(-1)
    expect(rowOf(groups, null)).toBe(-1)
  })
})
