// Words for a finding group and its sites, as the preview and the list show them. A stand-in until the shared
// messages module lands: titles from the existing title table, a plain headline from the group's numbers.
import { findingTitle, SEVERITY_WORDS } from '#shared/analysis-view'
import type { FindingGroup, Severity } from '#shared/finding-groups'

export { findingTitle }

export const SEVERITY_SYMBOLS: Record<Severity, string> = { error: '▲', warning: '◆', info: '●' }
export const SEVERITY_LABELS: Record<Severity, string> = SEVERITY_WORDS

/** A whole number with thin spaces between thousands: 22 500. */
export function formatCount(value: number): string {
  return Math.round(value)
    .toString()
    .replace(/\B(?=(\d{3})+(?!\d))/g, '\u2009')
}

export function formatMmValue(value: number): string {
  return `${Number(value.toFixed(2))} mm`
}

function limitOf(group: Pick<FindingGroup, 'facts'>): number | null {
  const limit = group.facts.limitMm
  return typeof limit === 'number' && Number.isFinite(limit) ? limit : null
}

export function describeGroup(group: FindingGroup): { title: string; headline: string; advice: string } {
  const limit = limitOf(group)
  const places = `${formatCount(group.count)} ${group.count === 1 ? 'place' : 'places'}`
  return { title: findingTitle(group.code), headline: limit === null ? places : `${places}, limit ${formatMmValue(limit)}`, advice: '' }
}

export function describeSite(group: FindingGroup, value: number): string {
  if (!Number.isFinite(value)) return findingTitle(group.code)
  const limit = limitOf(group)
  return `${formatMmValue(value)}${limit === null ? '' : ` (limit ${formatMmValue(limit)})`}`
}
