// Findings as the engine reports them and the pages show them: one group per kind and cause, with
// statistics and a packed table of every site. Messages are made from a group's code and numbers
// when shown (shared/finding-messages.ts), never stored per site.
export type Severity = 'error' | 'warning' | 'info'

export interface FindingStats {
  /** Of the measured value over the group's sites, in mm. */
  min: number
  median: number
  max: number
  /** Equal-width bins from `fromMm` to `toMm`. */
  histogram: { fromMm: number; toMm: number; counts: number[] }
}

export interface FindingGroup {
  /** Names the group within a revision (code, cause and limit), so a member acknowledges it once. */
  key: string
  code: string
  severity: Severity
  /** What tells groups of one code apart (for example a bridge between two cuts or across a neck); '' when a code has one cause. */
  cause: string
  /** Number of sites. */
  count: number
  /** The numbers (and a few words, such as a colour's name) the message is made from: limitMm, kerfMm, … */
  facts: Record<string, number | string>
  /** The measured value over the sites, when the sites have one. */
  stats: FindingStats | null
  /** Box round every site, [minX, minY, maxX, maxY] in mm in the drawing's frame. */
  box: [number, number, number, number]
  /** The group's sites are rows firstSite … firstSite + count − 1 of the site table, worst first. */
  firstSite: number
}

/**
 * Every site of every group, one row per site, rows of a group together and in the groups' order.
 * `value` is NaN where a site has no measured value; `contourB` is −1 where a site concerns one contour
 * (and `contourA` −1 where it concerns none). Contour ids index the preview geometry.
 */
export interface FindingSites {
  count: number
  /** x0, y0, x1, y1, … in mm. */
  xy: Float32Array
  value: Float32Array
  contourA: Int32Array
  contourB: Int32Array
}

export const SEVERITIES: readonly Severity[] = ['error', 'warning', 'info']

/** Sites and groups by severity, for verdicts and the summary columns. */
export interface FindingCounts {
  errors: number
  warnings: number
  notes: number
  errorGroups: number
  warningGroups: number
  noteGroups: number
}

export function countGroups(groups: readonly Pick<FindingGroup, 'severity' | 'count'>[]): FindingCounts {
  const counts: FindingCounts = { errors: 0, warnings: 0, notes: 0, errorGroups: 0, warningGroups: 0, noteGroups: 0 }
  for (const group of groups) {
    if (group.severity === 'error') {
      counts.errors += group.count
      counts.errorGroups++
    } else if (group.severity === 'warning') {
      counts.warnings += group.count
      counts.warningGroups++
    } else {
      counts.notes += group.count
      counts.noteGroups++
    }
  }
  return counts
}

export function emptyCounts(): FindingCounts {
  return countGroups([])
}

export function addCounts(a: FindingCounts, b: FindingCounts): FindingCounts {
  return {
    errors: a.errors + b.errors,
    warnings: a.warnings + b.warnings,
    notes: a.notes + b.notes,
    errorGroups: a.errorGroups + b.errorGroups,
    warningGroups: a.warningGroups + b.warningGroups,
    noteGroups: a.noteGroups + b.noteGroups,
  }
}

export function worstSeverity(counts: FindingCounts): Severity | null {
  return counts.errors ? 'error' : counts.warnings ? 'warning' : counts.notes ? 'info' : null
}
