import type { Knex } from 'knex'
import type { TurnaroundReport, TurnaroundRow } from '#shared/schemas/reports'
import { minutesBetween } from '../workshop-time'
import { reportOf, type ReportRange } from './range'
import { groupBy, mean, median, rounded } from './statistics'

const REVIEW_OUTCOMES = ['approved', 'changes_requested', 'rejected'] as const

interface StateEvent {
  job_id: number
  to_state: string
  created_at: string
  title: string
  cutter_name: string
}

/**
 * Review turnaround: for each submission made in the range, the elapsed hours (nights and weekends
 * included) until staff first approved, asked for changes or turned the job down. A job sent back and
 * submitted again counts once per submission; submissions still waiting are counted, not timed; withdrawn ones are neither.
 */
export async function turnaroundReport(db: Knex, range: ReportRange): Promise<TurnaroundReport> {
  const submittedInRange = db('job_events').where({ to_state: 'submitted' }).where('created_at', '>=', range.fromIso).where('created_at', '<', range.toIso).select('job_id')
  const query = db('job_events as e')
    .join('jobs as j', 'j.id', 'e.job_id')
    .join('cutters as c', 'c.id', 'j.cutter_id')
    .whereIn('e.job_id', submittedInRange)
    .whereIn('e.to_state', ['submitted', 'withdrawn', ...REVIEW_OUTCOMES])
    .where('e.created_at', '>=', range.fromIso)
    // Notes logged against a job (a cut problem) repeat its state; only real moves count.
    .whereRaw('e.from_state is distinct from e.to_state')
    .orderBy(['e.job_id', 'e.created_at', 'e.id'])
    .select('e.job_id', 'e.to_state', 'e.created_at', 'j.title', 'c.name as cutter_name')
  if (range.cutterId) query.where('j.cutter_id', range.cutterId)
  const events: StateEvent[] = await query
  const rows: TurnaroundRow[] = []
  let waiting = 0
  for (const jobEvents of groupBy(events, (e) => e.job_id).values()) {
    let submission: StateEvent | null = null
    for (const event of jobEvents) {
      if (event.to_state === 'submitted') submission = event.created_at < range.toIso ? event : null
      else if (submission && event.to_state !== 'withdrawn') {
        const hours = rounded(minutesBetween(submission.created_at, event.created_at) / 60, 2)!
        rows.push({ jobId: event.job_id, jobTitle: event.title, cutterName: event.cutter_name, submittedAt: submission.created_at, reviewedAt: event.created_at, outcome: event.to_state as TurnaroundRow['outcome'], hours })
        submission = null
      } else submission = null
    }
    if (submission) waiting++
  }
  const hours = rows.map((r) => r.hours)
  return reportOf(range, rows, { reviews: rows.length, waiting, medianHours: rounded(median(hours), 2), meanHours: rounded(mean(hours), 2) })
}
