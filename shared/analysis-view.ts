// What the pages show for the engine's findings: names in plain words, and the verdict above a preview.
import type { FindingCounts } from './finding-groups'

export type Severity = 'error' | 'warning' | 'info'

export interface FindingView {
  code: string
  severity: Severity
  message: string
  x: number
  y: number
  valueMm?: number
  limitMm?: number
  contours?: number[]
}

export const FINDING_TITLES: Record<string, string> = {
  'narrow-bridge': 'Bridge too narrow',
  'merged-cuts': 'Cuts run into each other',
  'small-hole': 'Hole too small',
  'duplicate-cut': 'Cut twice',
  'open-contour': 'Open line',
  'tiny-segment': 'Tiny segment',
  'self-intersection': 'Line crosses itself',
  'outside-sheet': 'Outside the sheet',
  'text-not-outlined': 'Text not converted to paths',
  'raster-image': 'Picture in the file',
  'unmapped-colour': 'Unknown line colour',
  'material-not-allowed': 'Material not allowed',
  'too-thick': 'Material too thick',
}

export const SEVERITY_WORDS: Record<Severity, string> = { error: 'Must fix', warning: 'Check', info: 'Note' }

export function findingTitle(code: string): string {
  return FINDING_TITLES[code] ?? code
}

/** The sentence above a file's or a job's findings: ready, or what stands in the way, counted in groups. */
export function verdictOf(counts: FindingCounts): { tone: 'ok' | 'warning' | 'error'; text: string } {
  const places = (n: number) => `${n.toLocaleString('en')} ${n === 1 ? 'place' : 'places'}`
  if (counts.errors > 0) {
    return { tone: 'error', text: `${counts.errorGroups} ${counts.errorGroups === 1 ? 'kind of problem' : 'kinds of problem'} to fix before this can be cut (${places(counts.errors)})` }
  }
  if (counts.warnings > 0) {
    return { tone: 'warning', text: `Ready once you give a reason for ${counts.warningGroups} ${counts.warningGroups === 1 ? 'group' : 'groups'} of warnings (${places(counts.warnings)})` }
  }
  return { tone: 'ok', text: 'Ready to submit' }
}
