// The words for a severity, and the verdict above a file's or a job's findings. Group titles and messages
// are in finding-messages.ts.
import type { FindingCounts, Severity } from './finding-groups'
import { formatCount } from './finding-messages'

export const SEVERITY_WORDS: Record<Severity, string> = { error: 'Must fix', warning: 'Check', info: 'Note' }

/** The sentence above a file's or a job's findings: ready, or what stands in the way, counted in groups. */
export function verdictOf(counts: FindingCounts): { tone: 'ok' | 'warning' | 'error'; text: string } {
  const places = (n: number) => `${formatCount(n)} ${n === 1 ? 'place' : 'places'}`
  if (counts.errors > 0) {
    return { tone: 'error', text: `${counts.errorGroups} ${counts.errorGroups === 1 ? 'kind of problem' : 'kinds of problem'} to fix before this can be cut (${places(counts.errors)})` }
  }
  if (counts.warnings > 0) {
    return { tone: 'warning', text: `Ready once you give a reason for ${counts.warningGroups} ${counts.warningGroups === 1 ? 'group' : 'groups'} of warnings (${places(counts.warnings)})` }
  }
  return { tone: 'ok', text: 'Ready to submit' }
}
