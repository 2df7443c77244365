// What the pages show for the engine's findings: names in plain words, and the verdict above a preview.
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

/** The sentence above the preview: ready, or how many problems stand in the way. */
export function verdictOf(findings: Pick<FindingView, 'severity'>[]): { tone: 'ok' | 'warning' | 'error'; text: string } {
  const errors = findings.filter((f) => f.severity === 'error').length
  const warnings = findings.filter((f) => f.severity === 'warning').length
  if (errors > 0) return { tone: 'error', text: `${errors} ${errors === 1 ? 'problem' : 'problems'} to fix before this can be cut` }
  if (warnings > 0) return { tone: 'warning', text: `Ready once you confirm ${warnings} ${warnings === 1 ? 'warning' : 'warnings'}` }
  return { tone: 'ok', text: 'Ready to submit' }
}
