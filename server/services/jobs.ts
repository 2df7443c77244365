import type { Knex } from 'knex'
import { EDITABLE_JOB_STATES, JOB_STATE_LABELS, type JobState } from '#shared/job-states'
import { isStaff, type SessionUser } from '#shared/roles'
import { worstSeverity } from '#shared/finding-groups'
import type { FindingRef, JobCreateInput } from '#shared/schemas/jobs'
import { Conflict, InvalidInput, NotFound } from '../utils/errors'
import { nowIso } from '../utils/rows'
import { keysetPage, mapPage, type PageOrder } from '../utils/paging'
import { analysisParamsFor } from './analysis-profile'
import { getCutter } from './catalog/cutters'
import { hasValidSignOff } from './catalog/sign-offs'
import { getMaterial } from './catalog/materials'
import { findProcessSetting } from './catalog/process-settings'
import { balancesOwed } from './balance'
import { estimateJob, type EstimatedFile, type JobEstimate } from './job-estimate'
import { timeCorrectionFor } from './time-calibration'
import { availableActions, transitionJob, type JobAction, type TransitionRecord } from './job-states'
import { acknowledgedGroups, recordAcknowledgements, unacknowledgedWarnings, type AcknowledgementInput } from './finding-acknowledgements'
import { countFindings, currentFiles, currentFindingGroups, filesOfJobs, type JobFileView } from './job-revisions'
import { type JobEventRow, jobEventView } from './job-events'
import { insertedId } from '../../db/dialect'

export { currentFiles, type JobFileView } from './job-revisions'

export interface JobRow {
  id: number
  member_id: number
  title: string
  cutter_id: number
  material_id: number
  sheet_id: number
  notes: string
  state: JobState
  warnings_acknowledgement: string | null
  override_reason: string | null
  override_by: number | null
  submitted_at: string | null
  /** Machine minutes staff logged at the finish (0006). */
  actual_minutes: number | null
  /** The estimate as it stood when the cut finished, so reports and calibration read what was known then (0007). */
  estimated_minutes: number | null
  estimated_cut_s: number | null
  estimated_pierce_s: number | null
  estimated_travel_s: number | null
  estimated_setup_s: number | null
  sheets_used: number | null
  cut_finished_at: string | null
  /** Collection: the shelf, the one-time code, and when the parts were ready, reminded about and collected (0007). */
  pickup_location: string | null
  pickup_code: string | null
  ready_at: string | null
  collected_at: string | null
  pickup_reminded_at: string | null
  /** A finish under way, written before the card is captured and cleared when the finish commits (0011). */
  finishing_minutes: number | null
  finishing_comment: string | null
  finishing_by: number | null
  finishing_since: string | null
  created_at: string
  updated_at: string
}

/** The job if the viewer may see it; another member's job is "not found", so ids are not confirmed. */
export async function jobForViewer(db: Knex, viewer: SessionUser, jobId: number): Promise<JobRow> {
  const job = await db<JobRow>('jobs').where({ id: jobId }).first()
  if (!job || (!isStaff(viewer) && job.member_id !== viewer.id)) throw new NotFound('No such job.')
  return job
}

export function assertEditable(job: JobRow): void {
  if (!EDITABLE_JOB_STATES.includes(job.state)) {
    throw new Conflict(`The job is "${JOB_STATE_LABELS[job.state]}": files and details can change only in a draft or when changes are asked for.`)
  }
}

export async function createJob(db: Knex, member: SessionUser, input: JobCreateInput): Promise<number> {
  // Validates the pair the same way the analysis does: allowed, set up here, and the sheet stocked.
  await analysisParamsFor(db, { cutterId: input.cutterId, materialId: input.materialId, sheetId: input.sheetId })
  const material = await getMaterial(db, input.materialId)
  const sheetId = input.sheetId ?? material.sheets[0]!.id
  return db.transaction(async (trx) => {
    const id = await insertedId(trx('jobs').insert({ member_id: member.id, title: input.title, cutter_id: input.cutterId, material_id: input.materialId, sheet_id: sheetId, notes: input.notes }))
    await trx('job_events').insert({ job_id: id, actor_id: member.id, from_state: null, to_state: 'draft', comment: '' })
    return id
  })
}

export async function updateJob(db: Knex, viewer: SessionUser, jobId: number, change: Partial<JobCreateInput>): Promise<void> {
  const job = await jobForViewer(db, viewer, jobId)
  assertEditable(job)
  const processChanges =
    (change.cutterId ?? job.cutter_id) !== job.cutter_id ||
    (change.materialId ?? job.material_id) !== job.material_id ||
    (change.sheetId ?? job.sheet_id) !== job.sheet_id
  if (processChanges) {
    if (await db('job_files').where({ job_id: jobId }).whereNull('removed_at').first()) {
      throw new Conflict('The files were checked for this cutter, material and sheet. Remove them first, or start a new job for another process.')
    }
    await analysisParamsFor(db, { cutterId: change.cutterId ?? job.cutter_id, materialId: change.materialId ?? job.material_id, sheetId: change.sheetId })
  }
  const patch: Record<string, unknown> = { updated_at: nowIso() }
  if (change.title !== undefined) patch.title = change.title
  if (change.notes !== undefined) patch.notes = change.notes
  if (change.cutterId !== undefined) patch.cutter_id = change.cutterId
  if (change.materialId !== undefined) {
    patch.material_id = change.materialId
    patch.sheet_id = change.sheetId ?? (await getMaterial(db, change.materialId)).sheets[0]!.id
  } else if (change.sheetId !== undefined) patch.sheet_id = change.sheetId
  await db('jobs').where({ id: jobId }).update(patch)
}

/** Catalog look-ups an estimate needs, each made once however many jobs are estimated with it. */
export function estimateLookups(db: Knex) {
  const memo = new Map<string, Promise<unknown>>()
  const once = <T>(key: string, load: () => Promise<T>): Promise<T> => {
    if (!memo.has(key)) memo.set(key, load())
    return memo.get(key) as Promise<T>
  }
  return {
    cutter: (id: number) => once(`cutter:${id}`, () => getCutter(db, id)),
    material: (id: number) => once(`material:${id}`, () => getMaterial(db, id)),
    setting: (cutterId: number, materialId: number) => once(`setting:${cutterId}:${materialId}`, () => findProcessSetting(db, cutterId, materialId)),
    correction: (cutterId: number, family: string) => once(`correction:${cutterId}:${family}`, () => timeCorrectionFor(db, cutterId, family)),
  }
}

export async function jobEstimate(db: Knex, job: JobRow, files: JobFileView[], lookups = estimateLookups(db)): Promise<JobEstimate> {
  return estimateFor(
    lookups,
    { cutterId: job.cutter_id, materialId: job.material_id, sheetId: job.sheet_id },
    files.map((f) => ({ fileId: f.id, quantity: f.quantity, figures: f.current })),
  )
}

/** One checked file (POST /api/analysis), estimated and priced exactly as a job holding only that file. */
export function fileEstimate(db: Knex, choice: { cutterId: number; materialId: number; sheetId?: number }, figures: EstimatedFile['figures']): Promise<JobEstimate> {
  return estimateFor(estimateLookups(db), choice, [{ fileId: 0, quantity: 1, figures }])
}

async function estimateFor(
  lookups: ReturnType<typeof estimateLookups>,
  choice: { cutterId: number; materialId: number; sheetId?: number },
  files: EstimatedFile[],
): Promise<JobEstimate> {
  const [cutter, material, setting] = await Promise.all([
    lookups.cutter(choice.cutterId),
    lookups.material(choice.materialId),
    lookups.setting(choice.cutterId, choice.materialId),
  ])
  const sheet = material.sheets.find((s) => s.id === choice.sheetId) ?? material.sheets[0]!
  return estimateJob(files, cutter, sheet, setting?.kerfMm ?? 0, await lookups.correction(choice.cutterId, material.family))
}

export async function jobDetail(db: Knex, viewer: SessionUser, jobId: number) {
  const job = await jobForViewer(db, viewer, jobId)
  const [files, member, cutter, material, events] = await Promise.all([
    currentFiles(db, jobId),
    db('users').where({ id: job.member_id }).first<{ id: number; name: string; email: string } | undefined>('id', 'name', 'email'),
    getCutter(db, job.cutter_id),
    getMaterial(db, job.material_id),
    db('job_events as e').leftJoin('users as u', 'u.id', 'e.actor_id').where('e.job_id', jobId).orderBy('e.id').select<JobEventRow[]>('e.*', 'u.name as actor_name'),
  ])
  const sheet = material.sheets.find((s) => s.id === job.sheet_id) ?? material.sheets[0]!
  const findingGroups = await currentFindingGroups(db, files)
  return {
    id: job.id,
    title: job.title,
    state: job.state,
    notes: job.notes,
    member,
    cutter: { id: cutter.id, name: cutter.name, kind: cutter.kind, bedWidthMm: cutter.bedWidthMm, bedHeightMm: cutter.bedHeightMm },
    material: { id: material.id, name: material.name, thicknessMm: material.thicknessMm, family: material.family },
    sheet,
    warningsAcknowledgement: job.warnings_acknowledgement,
    overrideReason: job.override_reason,
    submittedAt: job.submitted_at,
    createdAt: job.created_at,
    files,
    findings: countFindings(files),
    findingGroups,
    warningGroups: await acknowledgedGroups(db, findingGroups),
    estimate: await jobEstimate(db, job, files),
    /** Whether the member holds a valid induction sign-off for the job's cutter today: booking needs one. */
    memberSignedOff: await hasValidSignOff(db, job.member_id, job.cutter_id),
    /** What the cut cost beyond the hold and is not paid yet (pay from "My payments"). */
    balanceOwed: (await balancesOwed(db, { jobId }))[0] ?? null,
    events: await Promise.all(events.map((e) => jobEventView(db, jobId, e))),
    actions: availableActions(job.state, viewer, job.member_id),
  }
}

export type JobListFilter = { state?: string; scope?: 'mine' | 'all'; order?: 'waiting' | 'newest' }

function jobListQuery(db: Knex, viewer: SessionUser, filter: JobListFilter) {
  const query = db('jobs as j')
    .join('users as u', 'u.id', 'j.member_id')
    .join('cutters as c', 'c.id', 'j.cutter_id')
    .join('materials as m', 'm.id', 'j.material_id')
    .select('j.*', 'u.name as member_name', 'c.name as cutter_name', 'm.name as material_name', 'm.thickness_mm')
  if (!isStaff(viewer) || filter.scope !== 'all') query.where('j.member_id', viewer.id)
  if (filter.state) query.whereIn('j.state', filter.state.split(','))
  return query
}

const JOB_LIST_ORDERS = {
  // Oldest waiting first: the order of the review queue.
  waiting: { columns: ['coalesce(j.submitted_at, j.created_at)', 'j.id'], direction: 'asc', keyOf: (row: JobRow) => [row.submitted_at ?? row.created_at, row.id] },
  // Newest first: a member's own list.
  newest: { columns: ['j.created_at', 'j.id'], direction: 'desc', keyOf: (row: JobRow) => [row.created_at, row.id] },
} satisfies Record<string, PageOrder<JobRow>>

/** Every job the viewer may list (staff: `scope=all`), oldest waiting first. */
export async function listJobs(db: Knex, viewer: SessionUser, filter: JobListFilter) {
  return jobSummaries(db, await jobListQuery(db, viewer, filter).orderByRaw('coalesce(j.submitted_at, j.created_at) asc, j.id asc'))
}

/** One page of the same list: estimates are computed for the page's jobs only. */
export async function listJobsPage(db: Knex, viewer: SessionUser, filter: JobListFilter, page: { limit: number; cursor?: string }) {
  const jobs = await keysetPage<JobListRow>(jobListQuery(db, viewer, filter), JOB_LIST_ORDERS[filter.order ?? 'waiting'], page)
  return mapPage(jobs, (rows) => jobSummaries(db, rows))
}

/** A job as the lists read it: with its member's, cutter's and material's names. */
type JobListRow = JobRow & { member_name: string; cutter_name: string; material_name: string; thickness_mm: number }

async function jobSummaries(db: Knex, rows: JobListRow[]) {
  const summaries = []
  const lookups = estimateLookups(db)
  const filesByJob = await filesOfJobs(db, rows.map((r) => r.id))
  for (const row of rows) {
    const files = filesByJob.get(row.id)!
    const estimate = await jobEstimate(db, row, files, lookups)
    const counts = countFindings(files)
    summaries.push({
      id: row.id,
      title: row.title,
      state: row.state as JobState,
      memberName: row.member_name as string,
      cutterName: row.cutter_name as string,
      materialName: row.material_name as string,
      thicknessMm: row.thickness_mm as number,
      fileCount: files.length,
      billableMinutes: estimate.billableMinutes,
      totalPriceMinor: estimate.totalPriceMinor,
      currency: estimate.currency,
      worstFinding: worstSeverity(counts),
      findings: counts,
      submittedAt: row.submitted_at,
      createdAt: row.created_at,
    })
  }
  return summaries
}

/**
 * Submission: needs files, no unresolved errors (unless staff let this job through) and, for every group of
 * warnings, the member's reason (given per group, or one reason for all groups still open).
 */
export async function submitJob(
  db: Knex,
  member: SessionUser,
  jobId: number,
  input: { acknowledgement?: string; acknowledgements?: AcknowledgementInput[] } = {},
): Promise<TransitionRecord> {
  const job = await jobForViewer(db, member, jobId)
  await analysisParamsFor(db, { cutterId: job.cutter_id, materialId: job.material_id, sheetId: job.sheet_id })
  // Files, findings and reasons are read in the transaction that submits, so a revision stored meanwhile is checked too.
  return db.transaction(async (trx) => {
    const files = await currentFiles(trx, jobId)
    if (files.length === 0) throw new InvalidInput('Add at least one file before submitting.')
    const counts = countFindings(files)
    if (counts.errors > 0 && !job.override_reason) {
      throw new InvalidInput(`${counts.errorGroups} ${counts.errorGroups === 1 ? 'kind of problem needs' : 'kinds of problem need'} fixing before this job can be submitted (${counts.errors} ${counts.errors === 1 ? 'place' : 'places'}). Upload corrected files, or ask the staff.`, { errors: counts.errors })
    }
    const fileGroups = await currentFindingGroups(trx, files)
    const warnings = await acknowledgedGroups(trx, fileGroups)
    await recordAcknowledgements(trx, member, fileGroups, unacknowledgedWarnings(warnings), input.acknowledgements ?? [], input.acknowledgement ?? '')
    const summary = warnings.length > 0 ? `${warnings.length} ${warnings.length === 1 ? 'group' : 'groups'} of warnings acknowledged (${counts.warnings} ${counts.warnings === 1 ? 'place' : 'places'})` : ''
    await trx('jobs').where({ id: jobId }).update({ warnings_acknowledgement: warnings.length > 0 ? summary : null })
    return transitionJob(trx, jobId, 'submit', member, { comment: summary })
  })
}

/** Review and the later steps: every move goes through transitionJob; approval re-checks for errors. */
export async function moveJob(db: Knex, actor: SessionUser, jobId: number, action: Exclude<JobAction, 'submit' | 'book' | 'unbook'>, options: { comment?: string; findingRef?: FindingRef } = {}): Promise<TransitionRecord> {
  const job = await jobForViewer(db, actor, jobId)
  if (action === 'approve' && !job.override_reason) {
    const counts = countFindings(await currentFiles(db, jobId))
    if (counts.errors > 0) throw new Conflict(`This job still has ${counts.errorGroups} kind(s) of error in ${counts.errors} place(s). Ask for changes, or record an override with a reason first.`)
  }
  if ((action === 'withdraw' || action === 'cancel') && job.state === 'booked') {
    // The booking carries the money (a hold, perhaps a late fee): it is cancelled first, under its policy.
    throw new Conflict('This job has a booking. Cancel the booking first (from My bookings or the calendar), then withdraw the job.')
  }
  return db.transaction((trx) => transitionJob(trx, jobId, action, actor, options))
}

export async function recordOverride(db: Knex, staff: SessionUser, jobId: number, reason: string): Promise<void> {
  const job = await jobForViewer(db, staff, jobId)
  if (!['draft', 'submitted', 'changes_requested'].includes(job.state)) throw new Conflict('Limits can be overridden only before approval.')
  await db.transaction(async (trx) => {
    await trx('jobs').where({ id: jobId }).update({ override_reason: reason, override_by: staff.id, updated_at: nowIso() })
    await trx('job_events').insert({ job_id: jobId, actor_id: staff.id, from_state: job.state, to_state: job.state, comment: `Limit override: ${reason}` })
  })
}
