import type { FindingGroup, FindingSites, FindingStats, Severity } from '../../shared/finding-groups'
import { grownArray } from './growArray'

/** Which sites of a group come first: the smallest value (a bridge, a hole), the largest (a length cut twice), or the order found. */
export type WorstFirst = 'smallest' | 'largest' | 'as-found'

/** What makes a group: one code, severity, cause and limit, with the facts its message is made from. */
export interface GroupSpec {
  code: string
  severity: Severity
  /** What tells groups of one code apart; '' when the code has one cause. */
  cause?: string
  /** Added to the facts as `limitMm` and named in the key. */
  limitMm?: number
  facts?: Record<string, number | string>
  worstFirst?: WorstFirst
}

const HISTOGRAM_BINS = 10
const INITIAL_CAPACITY = 16

/**
 * The sites of one group, in flat growable arrays (no object per site):
 * position, measured value (NaN when none) and the one or two contours.
 */
export class SiteList {
  readonly spec: GroupSpec
  readonly key: string
  count = 0
  xy = new Float64Array(2 * INITIAL_CAPACITY)
  value = new Float64Array(INITIAL_CAPACITY)
  contourA = new Int32Array(INITIAL_CAPACITY)
  contourB = new Int32Array(INITIAL_CAPACITY)

  constructor(spec: GroupSpec, key: string) {
    this.spec = spec
    this.key = key
  }

  add(x: number, y: number, value = Number.NaN, contourA = -1, contourB = -1): void {
    if (this.count === this.value.length) this.grow()
    const site = this.count++
    this.xy[2 * site] = x
    this.xy[2 * site + 1] = y
    this.value[site] = value
    this.contourA[site] = contourA
    this.contourB[site] = contourB
  }

  /** Adds to a fact that counts over the group (the lines drawn in an unmapped colour, of which only the first is a site). */
  addToFact(name: string, amount: number): void {
    const facts = (this.spec.facts ??= {})
    facts[name] = ((facts[name] as number | undefined) ?? 0) + amount
  }

  private grow(): void {
    const capacity = 2 * this.value.length
    this.xy = grownArray(this.xy, 2 * capacity)
    this.value = grownArray(this.value, capacity)
    this.contourA = grownArray(this.contourA, capacity)
    this.contourB = grownArray(this.contourB, capacity)
  }
}

/**
 * Collects an analysis's findings as groups with their sites: the reader and
 * every check add sites to the group of their code, severity, cause and
 * limit. One collector serves one analysis (no state between analyses).
 */
export class FindingCollector {
  private readonly lists = new Map<string, SiteList>()

  /** The site list of a group, made on first use; later specs of the same key must agree on the severity. */
  group(spec: GroupSpec): SiteList {
    const key = groupKey(spec.code, spec.cause ?? '', spec.limitMm)
    const existing = this.lists.get(key)
    if (existing) {
      if (existing.spec.severity !== spec.severity) throw new Error(`Finding group ${key} given two severities`)
      return existing
    }
    const list = new SiteList({ ...spec, facts: spec.facts ? { ...spec.facts } : undefined }, key)
    this.lists.set(key, list)
    return list
  }

  /** Site count of every group of a code. */
  countOf(code: string): number {
    let count = 0
    for (const list of this.lists.values()) if (list.spec.code === code) count += list.count
    return count
  }

  /** The groups of a code (for summaries). */
  listsOf(code: string): SiteList[] {
    return [...this.lists.values()].filter((list) => list.spec.code === code)
  }

  get siteCount(): number {
    let count = 0
    for (const list of this.lists.values()) count += list.count
    return count
  }

  /** Groups with sites, errors first, then warnings, then notes (in the order they were made within a severity), and the site table in the same order, each group worst first. */
  finish(): { findingGroups: FindingGroup[]; sites: FindingSites } {
    const lists = [...this.lists.values()].filter((list) => list.count > 0)
    lists.sort((a, b) => SEVERITY_RANK[a.spec.severity] - SEVERITY_RANK[b.spec.severity])
    const total = lists.reduce((sum, list) => sum + list.count, 0)
    const sites: FindingSites = {
      count: total,
      xy: new Float32Array(2 * total),
      value: new Float32Array(total),
      contourA: new Int32Array(total),
      contourB: new Int32Array(total),
    }
    const findingGroups: FindingGroup[] = []
    let firstSite = 0
    for (const list of lists) {
      const order = worstFirstOrder(list)
      const box: [number, number, number, number] = [Infinity, Infinity, -Infinity, -Infinity]
      const values = new Float64Array(list.count)
      let measured = 0
      for (let slot = 0; slot < list.count; slot++) {
        const site = order === null ? slot : order[slot]!
        const row = firstSite + slot
        const x = list.xy[2 * site]!
        const y = list.xy[2 * site + 1]!
        sites.xy[2 * row] = x
        sites.xy[2 * row + 1] = y
        sites.value[row] = list.value[site]!
        sites.contourA[row] = list.contourA[site]!
        sites.contourB[row] = list.contourB[site]!
        if (x < box[0]) box[0] = x
        if (y < box[1]) box[1] = y
        if (x > box[2]) box[2] = x
        if (y > box[3]) box[3] = y
        // Statistics of the values as the site table stores them, so they agree with the sites a page reads.
        if (!Number.isNaN(list.value[site])) values[measured++] = Math.fround(list.value[site]!)
      }
      const { spec } = list
      const facts: Record<string, number | string> = { ...spec.facts }
      if (spec.limitMm !== undefined) facts.limitMm = spec.limitMm
      findingGroups.push({
        key: list.key,
        code: spec.code,
        severity: spec.severity,
        cause: spec.cause ?? '',
        count: list.count,
        facts,
        stats: measured > 0 ? findingStats(values.subarray(0, measured)) : null,
        box,
        firstSite,
      })
      firstSite += list.count
    }
    return { findingGroups, sites }
  }
}

const SEVERITY_RANK: Record<Severity, number> = { error: 0, warning: 1, info: 2 }

/** The stable name of a group: code, cause and limit (the limit as a short decimal). */
function groupKey(code: string, cause: string, limitMm: number | undefined): string {
  return `${code}:${cause}:${limitMm === undefined ? '' : String(Number(limitMm.toPrecision(12)))}`
}

/** Site order worst first (a stable sort by value), or null when the sites already are in that order. */
function worstFirstOrder(list: SiteList): Uint32Array | null {
  const direction = list.spec.worstFirst ?? 'as-found'
  if (direction === 'as-found') return null
  const sign = direction === 'smallest' ? 1 : -1
  const { value, count } = list
  let sorted = true
  for (let site = 1; site < count && sorted; site++) if (sign * (value[site]! - value[site - 1]!) < 0) sorted = false
  if (sorted) return null
  const order = new Uint32Array(count)
  for (let site = 0; site < count; site++) order[site] = site
  return order.sort((a, b) => sign * (value[a]! - value[b]!) || a - b)
}

/**
 * Minimum, median (the mean of the middle two of an even count), maximum and
 * a histogram of ~10 equal-width bins: bin i holds the values from
 * min + i·width up to the next bin's edge, the last one up to and with max.
 */
export function findingStats(values: Float64Array): FindingStats {
  const sorted = Float64Array.from(values).sort()
  const count = sorted.length
  const min = sorted[0]!
  const max = sorted[count - 1]!
  const middle = count >> 1
  const median = count % 2 === 1 ? sorted[middle]! : (sorted[middle - 1]! + sorted[middle]!) / 2
  const bins = max > min ? HISTOGRAM_BINS : 1
  const counts = new Array<number>(bins).fill(0)
  const width = (max - min) / bins
  let bin = 0
  for (let index = 0; index < count; index++) {
    while (bin < bins - 1 && sorted[index]! >= min + width * (bin + 1)) bin++
    counts[bin]!++
  }
  return { min, median, max, histogram: { fromMm: min, toMm: max, counts } }
}
