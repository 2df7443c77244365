import type { AnalysisResult, FindingGroup, Severity } from '../../server/analysis/index'

/** One site of a group, spelled out as a test reads it (values as stored: the site table's 32-bit floats). */
export interface SiteRecord {
  key: string
  code: string
  severity: Severity
  cause: string
  x: number
  y: number
  valueMm?: number
  limitMm?: number
  /** The one or two contours the site concerns; empty for none. */
  contours: number[]
  facts: FindingGroup['facts']
}

/** Every site of a result, group by group in the engine's order, or only those of one code. */
export function sitesOf(result: Pick<AnalysisResult, 'findingGroups' | 'sites'>, code?: string): SiteRecord[] {
  const { sites } = result
  const records: SiteRecord[] = []
  for (const group of result.findingGroups) {
    if (code !== undefined && group.code !== code) continue
    for (let row = group.firstSite; row < group.firstSite + group.count; row++) {
      const value = sites.value[row]
      const limit = group.facts.limitMm
      records.push({
        key: group.key,
        code: group.code,
        severity: group.severity,
        cause: group.cause,
        x: sites.xy[2 * row]!,
        y: sites.xy[2 * row + 1]!,
        ...(Number.isNaN(value) ? {} : { valueMm: value }),
        ...(typeof limit === 'number' ? { limitMm: limit } : {}),
        contours: [sites.contourA[row]!, sites.contourB[row]!].filter((contour) => contour >= 0),
        facts: group.facts,
      })
    }
  }
  return records
}

/** The group of a code (and cause), which must be the only one. */
export function groupOf(result: Pick<AnalysisResult, 'findingGroups'>, code: string, cause?: string): FindingGroup | undefined {
  const groups = result.findingGroups.filter((group) => group.code === code && (cause === undefined || group.cause === cause))
  if (groups.length > 1) throw new Error(`${groups.length} groups of ${code}`)
  return groups[0]
}
