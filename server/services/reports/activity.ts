import type { Knex } from 'knex'
import { liveBookings } from '../bookings'
import type { ReportRange } from './range'

// The two records of machine time the reports read: live job bookings and finished cuts.

export interface FinishedJob {
  id: number
  title: string
  member_id: number
  cutter_id: number
  material_id: number
  actual_minutes: number
  estimated_minutes: number | null
  estimated_setup_s: number | null
  sheets_used: number | null
  finished_at: string
}

/**
 * Jobs whose cut was finished in the range, with the minutes logged at finish (typed by staff or the
 * timer's own). Jobs finished before `cut_finished_at` was recorded fall back to their move to `cut`.
 */
export function finishedJobs(db: Knex, range: ReportRange): Promise<FinishedJob[]> {
  const withFinish = db('jobs as j')
    .whereNotNull('j.actual_minutes')
    .select('j.id', 'j.title', 'j.member_id', 'j.cutter_id', 'j.material_id', 'j.actual_minutes', 'j.estimated_minutes', 'j.estimated_setup_s', 'j.sheets_used')
    .select(db.raw("coalesce(j.cut_finished_at, (select max(e.created_at) from job_events e where e.job_id = j.id and e.to_state = 'cut')) as finished_at"))
  const query = db.from(withFinish.as('f')).where('finished_at', '>=', range.fromIso).where('finished_at', '<', range.toIso).orderBy('finished_at')
  if (range.cutterId) query.where('cutter_id', range.cutterId)
  return query
}

export interface JobBooking {
  member_id: number
  starts_at: string
  ends_at: string
}

/** Live job bookings (held within their time to pay, or confirmed) touching the range; staff blocks left out. */
export function jobBookings(db: Knex, range: ReportRange): Promise<JobBooking[]> {
  const query = liveBookings(db('bookings').where({ kind: 'job' }).where('starts_at', '<', range.toIso).where('ends_at', '>', range.fromIso))
  if (range.cutterId) query.where({ cutter_id: range.cutterId })
  return query.select('member_id', 'starts_at', 'ends_at')
}
