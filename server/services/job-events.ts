import type { Knex } from 'knex'
import type { SessionUser } from '#shared/roles'
import type { JobState } from '#shared/job-states'
import type { Page } from '#shared/schemas/paging'
import { keysetPage, mapPage } from '../utils/paging'
import { findingRefLabel } from './job-revisions'
import { jobForViewer } from './jobs'

export interface JobEventView {
  id: number
  at: string
  actorName: string
  from: JobState | null
  to: JobState
  comment: string
  /** The finding group a staff comment points at, in words. */
  finding: string | null
}

/** A row of job_events, joined with its actor's name as actor_name. */
export interface JobEventRow {
  id: number
  created_at: string
  actor_name: string | null
  from_state: JobState | null
  to_state: JobState
  comment: string
  finding_ref_json: string | null
}

/** A job's history (every move and note), oldest first, a page at a time. */
export async function jobEventsPage(db: Knex, viewer: SessionUser, jobId: number, page: { limit: number; cursor?: string }): Promise<Page<JobEventView>> {
  await jobForViewer(db, viewer, jobId)
  const query = db('job_events as e').leftJoin('users as u', 'u.id', 'e.actor_id').where('e.job_id', jobId).select('e.*', 'u.name as actor_name')
  const order = { columns: ['e.id'], direction: 'asc' as const, keyOf: (e: JobEventRow) => [e.id] }
  return mapPage(await keysetPage<JobEventRow>(query, order, page), (events) => Promise.all(events.map((e) => jobEventView(db, jobId, e))))
}

/** One row of job_events (joined with its actor's name as actor_name) as the job page's history shows it. */
export async function jobEventView(db: Knex, jobId: number, e: JobEventRow): Promise<JobEventView> {
  return {
    id: e.id,
    at: e.created_at,
    actorName: e.actor_name ?? 'Kerfbook',
    from: e.from_state,
    to: e.to_state,
    comment: e.comment,
    finding: await findingRefLabel(db, jobId, e.finding_ref_json ? JSON.parse(e.finding_ref_json) : null),
  }
}
