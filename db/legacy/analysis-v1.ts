// Revisions stored before findings were grouped kept every finding as an object with its message, and the
// preview as one JSON polyline per contour. Migration 0010 turns them into the current form with this.
import type { FindingGroup, FindingSites, Severity } from '../../shared/finding-groups'
import type { ContourSource, PreviewOperation } from '../../shared/packed-analysis'
import { PREVIEW_OPERATIONS } from '../../shared/packed-analysis'

export interface FindingV1 {
  code: string
  severity: Severity
  message: string
  x: number
  y: number
  valueMm?: number
  limitMm?: number
  contours?: number[]
}

export interface ContourV1 {
  operation: PreviewOperation
  closed: boolean
  points: number[]
}

const SEVERITY_RANK: Record<Severity, number> = { error: 0, warning: 1, info: 2 }

/**
 * One group per code, severity and limit, its sites in the order they were stored (the engine
 * already put the worst first). The first finding's message is kept as a fact, as old rows have no
 * cause to build a message from.
 */
export function groupFindingsV1(findings: FindingV1[]): { groups: FindingGroup[]; sites: FindingSites } {
  const byKey = new Map<string, FindingV1[]>()
  for (const finding of findings) {
    const key = `${finding.code}:${finding.severity}:${finding.limitMm ?? ''}`
    byKey.set(key, [...(byKey.get(key) ?? []), finding])
  }
  const ordered = [...byKey].sort(([, a], [, b]) => SEVERITY_RANK[a[0]!.severity] - SEVERITY_RANK[b[0]!.severity])
  const count = findings.length
  const sites: FindingSites = {
    count,
    xy: new Float32Array(2 * count),
    value: new Float32Array(count),
    contourA: new Int32Array(count),
    contourB: new Int32Array(count),
  }
  const groups: FindingGroup[] = []
  let row = 0
  for (const [key, members] of ordered) {
    const first = members[0]!
    const box: FindingGroup['box'] = [Infinity, Infinity, -Infinity, -Infinity]
    const firstSite = row
    for (const finding of members) {
      sites.xy[2 * row] = finding.x
      sites.xy[2 * row + 1] = finding.y
      sites.value[row] = finding.valueMm ?? Number.NaN
      sites.contourA[row] = finding.contours?.[0] ?? -1
      sites.contourB[row] = finding.contours?.[1] ?? -1
      box[0] = Math.min(box[0], finding.x)
      box[1] = Math.min(box[1], finding.y)
      box[2] = Math.max(box[2], finding.x)
      box[3] = Math.max(box[3], finding.y)
      row++
    }
    const facts: FindingGroup['facts'] = { message: first.message }
    if (first.limitMm !== undefined) facts.limitMm = first.limitMm
    groups.push({ key, code: first.code, severity: first.severity, cause: '', count: members.length, facts, stats: null, box, firstSite })
  }
  return { groups, sites }
}

/** The JSON polylines as the flat arrays the geometry encoder reads. */
export function contoursV1(contours: ContourV1[]): ContourSource {
  const count = contours.length
  const start = new Uint32Array(count + 1)
  const operation = new Uint8Array(count)
  const closed = new Uint8Array(count)
  let points = 0
  contours.forEach((contour, i) => {
    start[i] = points
    operation[i] = Math.max(0, PREVIEW_OPERATIONS.indexOf(contour.operation))
    closed[i] = contour.closed ? 1 : 0
    points += contour.points.length / 2
  })
  start[count] = points
  const xy = new Float64Array(2 * points)
  let offset = 0
  for (const contour of contours) {
    xy.set(contour.points, offset)
    offset += contour.points.length
  }
  return { count, start, operation, closed, xy }
}
