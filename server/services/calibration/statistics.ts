/**
 * Nearest-rank percentile: the smallest value with at least `percent`% of the values at or below it,
 * i.e. the value at 1-based rank ⌈percent/100 · n⌉ of the sorted list (the textbook nearest-rank
 * definition, from memory). It always returns one of the values, never an interpolation; the 50th is
 * the lower middle for an even count. NaN for an empty list, which callers rule out.
 */
export function nearestRankPercentile(values: readonly number[], percent: number): number {
  if (values.length === 0) return Number.NaN
  const sorted = [...values].sort((a, b) => a - b)
  const rank = Math.max(1, Math.ceil((percent / 100) * sorted.length))
  return sorted[Math.min(rank, sorted.length) - 1]!
}
