import type { Knex } from 'knex'
import { JOB_STATES, JOB_STATE_LABELS, type JobState } from '#shared/job-states'
import type { JobStateReport } from '#shared/schemas/reports'
import { reportOf, type ReportRange } from './range'

/** Jobs created in the range, counted by the state they are in now; every state listed, in workflow order. */
export async function jobStateReport(db: Knex, range: ReportRange): Promise<JobStateReport> {
  const query = db('jobs').where('created_at', '>=', range.fromIso).where('created_at', '<', range.toIso).groupBy('state').select('state').count({ jobs: '*' })
  if (range.cutterId) query.where({ cutter_id: range.cutterId })
  const counted = (await query) as unknown as { state: JobState; jobs: number | string }[]
  const counts = new Map(counted.map((r) => [r.state, Number(r.jobs)]))
  return reportOf(range, JOB_STATES.map((state) => ({ state, label: JOB_STATE_LABELS[state], jobs: counts.get(state) ?? 0 })))
}
