import type { Knex } from 'knex'
import { earliestStartTouching } from '../booking-spans'
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

const FINISHED_JOB_COLUMNS = ['j.id', 'j.title', 'j.member_id', 'j.cutter_id', 'j.material_id', 'j.actual_minutes', 'j.estimated_minutes', 'j.estimated_setup_s', 'j.sheets_used']

/**
 * Jobs whose cut was finished in the range, with the minutes logged at finish (typed by staff or the
 * timer's own). Jobs finished before `cut_finished_at` was recorded fall back to their move to `cut`.
 * Both halves find their rows through an index (jobs.cut_finished_at, migration 0013), never by a scan of every job.
 */
export function finishedJobs(db: Knex, range: ReportRange): Promise<FinishedJob[]> {
  return db.from(finishedJobsQuery(db, range).as('f')).orderBy(['finished_at', 'id']).select('*')
}

/** The same jobs as a subquery, for reports that sum them in the database. */
export function finishedJobsQuery(db: Knex, range: ReportRange): Knex.QueryBuilder {
  const recorded = db('jobs as j').whereNotNull('j.actual_minutes').where('j.cut_finished_at', '>=', range.fromIso).where('j.cut_finished_at', '<', range.toIso).select(...FINISHED_JOB_COLUMNS, 'j.cut_finished_at as finished_at')
  const lastCut = db('job_events as e').whereRaw('e.job_id = j.id').where('e.to_state', 'cut').max('e.created_at')
  const older = db.from(db('jobs as j').whereNotNull('j.actual_minutes').whereNull('j.cut_finished_at').select(...FINISHED_JOB_COLUMNS, lastCut.as('finished_at')).as('o')).where('finished_at', '>=', range.fromIso).where('finished_at', '<', range.toIso).select('*')
  if (range.cutterId) {
    recorded.where('j.cutter_id', range.cutterId)
    older.where('cutter_id', range.cutterId)
  }
  return recorded.unionAll(older)
}

export interface JobBooking {
  member_id: number
  starts_at: string
  ends_at: string
}

/** Live job bookings (held within their time to pay, or confirmed) touching the range; staff blocks left out. */
export async function jobBookings(db: Knex, range: ReportRange): Promise<JobBooking[]> {
  const query = liveBookings(db('bookings').where({ kind: 'job' }).where('starts_at', '<', range.toIso).where('ends_at', '>', range.fromIso))
  if (range.cutterId) query.where({ cutter_id: range.cutterId })
  return query.where('starts_at', '>', await earliestStartTouching(db, range.fromIso, range.cutterId)).select('member_id', 'starts_at', 'ends_at')
}
