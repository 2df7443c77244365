// Finding sites as markers: every site of every group, gathered per cell of a screen-space grid so that at a
// low zoom a crowd of sites shows as one badge with a count, and separates into single markers as one zooms in.
// The sites go once into a static R-tree; a view visits only the sites in it, O(log n + k), on typed arrays
// of one slot per cell (a few hundred on a screen).
import Flatbush from 'flatbush'
import type { FindingGroup, FindingSites, Severity } from '#shared/finding-groups'
import type { Box, Viewport } from './viewport'

/** Worst first: a cluster takes the severity of its worst site. */
export const SEVERITY_RANK: Record<Severity, number> = { error: 0, warning: 1, info: 2 }
export const SEVERITY_BY_RANK: readonly Severity[] = ['error', 'warning', 'info']

export interface SiteIndex {
  /** Group index of each row of the site table, −1 for a row no group claims. */
  groupOfRow: Int32Array
  /** Severity rank of each row (0 error … 2 info). */
  rankOfRow: Uint8Array
  tree: Flatbush | null
  /** Rows in the tree's order: the tree holds only rows with a group and finite coordinates. */
  rows: Int32Array
}

export function buildSiteIndex(groups: readonly FindingGroup[], sites: FindingSites): SiteIndex {
  const groupOfRow = new Int32Array(sites.count).fill(-1)
  const rankOfRow = new Uint8Array(sites.count)
  groups.forEach((group, g) => {
    const end = Math.min(group.firstSite + group.count, sites.count)
    for (let row = Math.max(group.firstSite, 0); row < end; row++) {
      groupOfRow[row] = g
      rankOfRow[row] = SEVERITY_RANK[group.severity]
    }
  })
  const kept: number[] = []
  for (let row = 0; row < sites.count; row++) {
    if (groupOfRow[row]! >= 0 && Number.isFinite(sites.xy[2 * row]) && Number.isFinite(sites.xy[2 * row + 1])) kept.push(row)
  }
  const rows = Int32Array.from(kept)
  let tree: Flatbush | null = null
  if (rows.length > 0) {
    // Float32 boxes, as the site table's own coordinates: half the memory of the default.
    tree = new Flatbush(rows.length, 16, Float32Array)
    for (const row of rows) tree.add(sites.xy[2 * row]!, sites.xy[2 * row + 1]!, sites.xy[2 * row]!, sites.xy[2 * row + 1]!)
    tree.finish()
  }
  return { groupOfRow, rankOfRow, tree, rows }
}

/** A marker on screen: one site (count 1) or a cluster of several. */
export interface MarkerCluster {
  /** Screen position in CSS pixels: the site itself, or the mean of a cluster's sites. */
  x: number
  y: number
  count: number
  /** Severity rank of the worst site in it. */
  rank: number
  /** The row of the site table it stands for: the single site, or a cluster's first row of its worst severity. */
  row: number
  /** Box round the sites in mm, for zooming into a cluster. */
  box: [number, number, number, number]
}

/** The side of a grid cell in CSS pixels: a little more than a four-digit badge, so neighbouring badges rarely overlap. */
export const CLUSTER_CELL_PX = 64

/**
 * Gathers the sites in view into grid cells of `cellPx` screen pixels. `exceptRow` (the selected site) is left
 * out, to be drawn on its own. The grid is anchored to the drawing, not the screen, so panning does not
 * reshuffle the clusters.
 */
export function clusterSites(
  index: SiteIndex,
  sites: FindingSites,
  view: Viewport,
  visible: Box,
  cellPx = CLUSTER_CELL_PX,
  exceptRow = -1,
): MarkerCluster[] {
  if (!index.tree) return []
  const cellMm = cellPx / view.scale
  const gridX0 = Math.floor(visible[0] / cellMm)
  const gridY0 = Math.floor(visible[1] / cellMm)
  const columns = Math.floor(visible[2] / cellMm) - gridX0 + 1
  const cellCount = columns * (Math.floor(visible[3] / cellMm) - gridY0 + 1)
  // Per cell: site count, sums for the mean, worst rank and its row, and the box round the sites.
  const count = new Int32Array(cellCount)
  const sum = new Float64Array(2 * cellCount)
  const best = new Int32Array(cellCount)
  const box = new Float32Array(4 * cellCount)
  const { xy } = sites
  const { rankOfRow, rows } = index
  // A view that holds every site walks the rows as they are rather than asking the tree for all of them.
  const tree = index.tree
  const everything = visible[0] <= tree.minX && visible[1] <= tree.minY && visible[2] >= tree.maxX && visible[3] >= tree.maxY
  const found: ArrayLike<number> = everything ? rows : tree.search(visible[0], visible[1], visible[2], visible[3]).map((k) => rows[k]!)
  for (let k = 0; k < found.length; k++) {
    const row = found[k]!
    if (row === exceptRow) continue
    const x = xy[2 * row]!
    const y = xy[2 * row + 1]!
    const cell = (Math.floor(y / cellMm) - gridY0) * columns + (Math.floor(x / cellMm) - gridX0)
    if (count[cell]! === 0) {
      best[cell] = row
      box[4 * cell] = box[4 * cell + 2] = x
      box[4 * cell + 1] = box[4 * cell + 3] = y
    } else {
      const rank = rankOfRow[row]!
      const bestRank = rankOfRow[best[cell]!]!
      if (rank < bestRank || (rank === bestRank && row < best[cell]!)) best[cell] = row
      if (x < box[4 * cell]!) box[4 * cell] = x
      if (y < box[4 * cell + 1]!) box[4 * cell + 1] = y
      if (x > box[4 * cell + 2]!) box[4 * cell + 2] = x
      if (y > box[4 * cell + 3]!) box[4 * cell + 3] = y
    }
    count[cell] = count[cell]! + 1
    sum[2 * cell] = sum[2 * cell]! + x
    sum[2 * cell + 1] = sum[2 * cell + 1]! + y
  }
  const clusters: MarkerCluster[] = []
  for (let cell = 0; cell < cellCount; cell++) {
    const n = count[cell]!
    if (n === 0) continue
    clusters.push({
      x: (sum[2 * cell]! / n - view.originX) * view.scale,
      y: (sum[2 * cell + 1]! / n - view.originY) * view.scale,
      count: n,
      rank: rankOfRow[best[cell]!]!,
      row: best[cell]!,
      box: [box[4 * cell]!, box[4 * cell + 1]!, box[4 * cell + 2]!, box[4 * cell + 3]!],
    })
  }
  // Worst drawn last, so it lies on top.
  return clusters.sort((a, b) => b.rank - a.rank || a.count - b.count)
}

/** The selection model of the preview and the list: site is the index within the group, 0 the worst. */
export interface SiteSelection {
  group: number
  site: number
}

export function rowOf(groups: readonly FindingGroup[], selection: SiteSelection | null): number {
  if (!selection) return -1
  const group = groups[selection.group]
  if (!group || selection.site < 0 || selection.site >= group.count) return -1
  return group.firstSite + selection.site
}

export function selectionOfRow(index: SiteIndex, groups: readonly FindingGroup[], row: number): SiteSelection | null {
  const group = index.groupOfRow[row] ?? -1
  return group >= 0 ? { group, site: row - groups[group]!.firstSite } : null
}
