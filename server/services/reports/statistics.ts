// Plain summary statistics and grouping for the reports; the statistics answer null for no values.

export function mean(values: number[]): number | null {
  return values.length ? values.reduce((sum, v) => sum + v, 0) / values.length : null
}

/** The middle value, or the mean of the two middle values when there is an even number of them. */
export function median(values: number[]): number | null {
  if (!values.length) return null
  const sorted = [...values].sort((a, b) => a - b)
  const middle = sorted.length >> 1
  return sorted.length % 2 ? sorted[middle]! : (sorted[middle - 1]! + sorted[middle]!) / 2
}

/**
 * Nearest-rank percentile: the smallest value with at least p % of the values at or below it,
 * i.e. the ⌈p/100 · n⌉-th smallest. It is always one of the values, never an interpolation.
 */
export function nearestRankPercentile(values: number[], percent: number): number | null {
  if (!values.length) return null
  const sorted = [...values].sort((a, b) => a - b)
  return sorted[Math.max(1, Math.ceil((percent / 100) * sorted.length)) - 1]!
}

/** Rounded for display and CSV: report figures are read by people, not fed back into sums. */
export function rounded(value: number | null, digits = 1): number | null {
  return value === null ? null : Math.round(value * 10 ** digits) / 10 ** digits
}

/** Items grouped by a key, groups and items in the order first seen. */
export function groupBy<T, K>(items: T[], keyOf: (item: T) => K): Map<K, T[]> {
  const groups = new Map<K, T[]>()
  for (const item of items) {
    const key = keyOf(item)
    const group = groups.get(key)
    if (group) group.push(item)
    else groups.set(key, [item])
  }
  return groups
}
