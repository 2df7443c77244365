import type { Knex } from 'knex'
import { addCounts, countGroups, emptyCounts, worstSeverity, type FindingCounts, type FindingGroup, type Severity } from '#shared/finding-groups'
import { findingTitle, formatCount } from '#shared/finding-messages'
import type { SessionUser } from '#shared/roles'
import { NotFound } from '../utils/errors'
import { jobForViewer } from './jobs'
import { SUMMARY_COLUMN_NAMES, figuresOf, type RevisionFigures, type StoredAnalysis, type SummaryColumns } from './revision-summary'

// Reading a job's file revisions. Lists and estimates use the summary columns only; the finding groups
// (small JSON) are read for one job at a time; the packed geometry and sites only by the preview routes.

type RevisionRow = SummaryColumns & {
  id: number
  job_file_id: number
  revision: number
  original_name: string
  size_bytes: number
  created_at: string
}

const REVISION_COLUMNS = ['id', 'job_file_id', 'revision', 'original_name', 'size_bytes', 'created_at', ...SUMMARY_COLUMN_NAMES]

export interface RevisionSummary extends RevisionFigures {
  id: number
  revision: number
  originalName: string
  sizeBytes: number
  uploadedAt: string
  worstSeverity: Severity | null
}

export interface JobFileView {
  id: number
  name: string
  quantity: number
  current: RevisionSummary
  revisions: RevisionSummary[]
  /** How the current revision differs from the one before it (findings counted by site). */
  change: { cutLengthMm: number; pierces: number; findings: number } | null
}

function summaryOf(row: RevisionRow): RevisionSummary {
  const figures = figuresOf(row)
  return {
    id: row.id,
    revision: row.revision,
    originalName: row.original_name,
    sizeBytes: row.size_bytes,
    uploadedAt: row.created_at,
    worstSeverity: worstSeverity(figures.counts),
    ...figures,
  }
}

const siteTotal = (counts: FindingCounts) => counts.errors + counts.warnings + counts.notes

/** The job's current files, each with its newest revision's figures and the list of older revisions. */
export async function currentFiles(db: Knex, jobId: number): Promise<JobFileView[]> {
  return (await filesOfJobs(db, [jobId])).get(jobId) ?? []
}

/** Current files of many jobs in two queries that read summary columns only. */
export async function filesOfJobs(db: Knex, jobIds: number[]): Promise<Map<number, JobFileView[]>> {
  const files = await db('job_files').whereIn('job_id', jobIds).whereNull('removed_at').orderBy('id')
  const revisions = await db<RevisionRow>('file_revisions')
    .whereIn('job_file_id', files.map((f) => f.id))
    .orderBy(['job_file_id', { column: 'revision', order: 'desc' }])
    .select<RevisionRow[]>(REVISION_COLUMNS)
  const revisionsByFile = new Map<number, RevisionSummary[]>()
  for (const row of revisions) {
    const list = revisionsByFile.get(row.job_file_id) ?? []
    list.push(summaryOf(row))
    revisionsByFile.set(row.job_file_id, list)
  }
  const byJob = new Map<number, JobFileView[]>(jobIds.map((id) => [id, []]))
  for (const file of files) {
    const own = revisionsByFile.get(file.id) ?? []
    const [latest, previous] = own
    byJob.get(file.job_id)!.push({
      id: file.id,
      name: file.name,
      quantity: file.quantity,
      current: latest!,
      revisions: own,
      change: previous
        ? {
            cutLengthMm: latest!.cut.lengthMm - previous.cut.lengthMm,
            pierces: latest!.cut.pierces - previous.cut.pierces,
            findings: siteTotal(latest!.counts) - siteTotal(previous.counts),
          }
        : null,
    })
  }
  return byJob
}

export function countFindings(files: Pick<JobFileView, 'current'>[]): FindingCounts {
  return files.reduce((sum, file) => addCounts(sum, file.current.counts), emptyCounts())
}

export interface FileFindingGroups {
  fileId: number
  fileName: string
  revision: number
  revisionId: number
  groups: FindingGroup[]
}

/** The finding groups of the job's current revisions (small: one entry per kind and cause, no sites). */
export async function currentFindingGroups(db: Knex, files: JobFileView[]): Promise<FileFindingGroups[]> {
  const rows = await db('file_revisions')
    .whereIn('id', files.map((f) => f.current.id))
    .select('id', 'analysis_json')
  const groupsById = new Map<number, FindingGroup[]>(rows.map((row) => [row.id, (JSON.parse(row.analysis_json) as StoredAnalysis).findingGroups ?? []]))
  return files.map((file) => ({
    fileId: file.id,
    fileName: file.name,
    revision: file.current.revision,
    revisionId: file.current.id,
    groups: groupsById.get(file.current.id) ?? [],
  }))
}

async function revisionRowFor(db: Knex, viewer: SessionUser, jobId: number, fileId: number, revision: number) {
  await jobForViewer(db, viewer, jobId)
  const row = await db('file_revisions as r')
    .join('job_files as f', 'f.id', 'r.job_file_id')
    .where({ 'f.job_id': jobId, 'f.id': fileId, 'r.revision': revision })
    .first('r.id', 'r.revision', 'r.original_name', 'r.sha256', 'r.analysis_json')
  if (!row) throw new NotFound('No such file revision.')
  return row as { id: number; revision: number; original_name: string; sha256: string; analysis_json: string }
}

/** One revision's figures and finding groups (no sites, no geometry: those have routes of their own). */
export async function revisionAnalysis(db: Knex, viewer: SessionUser, jobId: number, fileId: number, revision: number) {
  const row = await revisionRowFor(db, viewer, jobId, fileId, revision)
  const analysis = JSON.parse(row.analysis_json) as StoredAnalysis
  return { ...analysis, counts: countGroups(analysis.findingGroups), revision: row.revision, originalName: row.original_name }
}

export type RevisionPayloadKind = 'geometry' | 'sites'

/** A revision's packed preview geometry or finding sites, gzip-compressed as stored, with a tag that never changes. */
export async function revisionPayload(
  db: Knex,
  viewer: SessionUser,
  jobId: number,
  fileId: number,
  revision: number,
  kind: RevisionPayloadKind,
): Promise<{ gzipped: Buffer; etag: string }> {
  const row = await revisionRowFor(db, viewer, jobId, fileId, revision)
  const payload = await db('revision_payloads').where({ file_revision_id: row.id }).first(kind === 'geometry' ? 'geometry_gz as bytes' : 'sites_gz as bytes')
  if (!payload) throw new NotFound('This revision has no stored preview.')
  return { gzipped: payload.bytes as Buffer, etag: `"${kind}-${row.id}-${row.sha256.slice(0, 16)}"` }
}

/** "Bridge too narrow, 12 places in side-panel (revision 2)": a staff pointer at a group, in words; null when it names nothing of the job. */
export async function findingRefLabel(db: Knex, jobId: number, ref: { fileId: number; revision: number; key?: string } | null): Promise<string | null> {
  if (!ref?.key) return null
  const row = await db('file_revisions as r')
    .join('job_files as f', 'f.id', 'r.job_file_id')
    .where({ 'f.job_id': jobId, 'f.id': ref.fileId, 'r.revision': ref.revision })
    .first('f.name', 'r.analysis_json')
  const group = row ? (JSON.parse(row.analysis_json) as StoredAnalysis).findingGroups?.find((g) => g.key === ref.key) : undefined
  if (!group) return null
  return `${findingTitle(group.code)}, ${formatCount(group.count)} ${group.count === 1 ? 'place' : 'places'} in ${row.name} (revision ${ref.revision})`
}
