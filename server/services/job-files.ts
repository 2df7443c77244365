import type { Knex } from 'knex'
import { MAX_FILES_PER_JOB } from '#shared/schemas/jobs'
import type { SessionUser } from '#shared/roles'
import { analysisOwnerKey, analyzeInWorker, type PackedAnalysis } from '../utils/analysis-pool'
import type { CutFileUpload } from '../utils/cut-file-upload'
import { Conflict, NotFound } from '../utils/errors'
import { nowIso } from '../utils/rows'
import { storeUpload } from '../utils/upload-store'
import { analysisParamsFor } from './analysis-profile'
import { assertEditable, jobForViewer, type JobRow } from './jobs'
import { summaryColumns, type StoredAnalysis } from './revision-summary'
import { insertedId } from '../../db/dialect'

/** Analyses with the job's process in the fair worker queue and stores the file before its row, so a row never lacks its file. */
async function analyseAndStore(db: Knex, job: JobRow, upload: CutFileUpload, uploader: SessionUser): Promise<StoredRevision> {
  const params = await analysisParamsFor(db, { cutterId: job.cutter_id, materialId: job.material_id, sheetId: job.sheet_id })
  const packed = await analyzeInWorker(upload.svgText, params, {
    ownerKey: analysisOwnerKey(uploader),
    format: upload.format,
    label: upload.filename,
    signal: upload.closed,
  })
  const sha256 = storeUpload(upload.svgText)
  return { packed, sha256 }
}

interface StoredRevision {
  packed: PackedAnalysis
  sha256: string
}

/** The revision row with its summary columns, then its packed geometry and sites, in the caller's transaction. */
async function insertRevision(trx: Knex, fileId: number, revision: number, upload: CutFileUpload, uploaderId: number, stored: StoredRevision): Promise<void> {
  const analysis = stored.packed.result as StoredAnalysis
  const revisionId = await insertedId(trx('file_revisions').insert({
    job_file_id: fileId,
    revision,
    sha256: stored.sha256,
    original_name: upload.filename,
    size_bytes: upload.sizeBytes,
    content_type: upload.format === 'dxf' ? 'image/vnd.dxf' : 'image/svg+xml',
    analysis_json: JSON.stringify(analysis),
    uploaded_by: uploaderId,
    ...summaryColumns(analysis),
  }))
  await trx('revision_payloads').insert({ file_revision_id: revisionId, geometry_gz: Buffer.from(stored.packed.geometryGz), sites_gz: Buffer.from(stored.packed.sitesGz) })
}

async function assertStillEditable(trx: Knex, jobId: number, adding: boolean): Promise<void> {
  assertEditable((await trx<JobRow>('jobs').where({ id: jobId }).first())!)
  if (!adding) return
  const count = await trx('job_files').where({ job_id: jobId }).whereNull('removed_at').count<{ n: number }[]>({ n: '*' }).first()
  if (Number(count?.n ?? 0) >= MAX_FILES_PER_JOB) throw new Conflict(`A job holds at most ${MAX_FILES_PER_JOB} files; start another job for the rest.`)
}

export async function addJobFile(db: Knex, viewer: SessionUser, jobId: number, upload: CutFileUpload, quantity: number): Promise<number> {
  const job = await jobForViewer(db, viewer, jobId)
  assertEditable(job)
  const count = await db('job_files').where({ job_id: jobId }).whereNull('removed_at').count<{ n: number }[]>({ n: '*' }).first()
  if (Number(count?.n ?? 0) >= MAX_FILES_PER_JOB) throw new Conflict(`A job holds at most ${MAX_FILES_PER_JOB} files; start another job for the rest.`)
  const stored = await analyseAndStore(db, job, upload, viewer)
  return db.transaction(async (trx) => {
    // The analysis took a while: the job may have been submitted meanwhile.
    await assertStillEditable(trx, jobId, true)
    const fileId = await insertedId(trx('job_files').insert({ job_id: jobId, name: upload.filename.replace(/\.(svg|dxf)$/i, ''), quantity }))
    await insertRevision(trx, fileId, 1, upload, viewer.id, stored)
    await trx('jobs').where({ id: jobId }).update({ updated_at: nowIso() })
    return fileId
  })
}

/** A new revision of a file; the older revisions and their analyses stay as they were. */
export async function replaceJobFile(db: Knex, viewer: SessionUser, jobId: number, fileId: number, upload: CutFileUpload): Promise<number> {
  const job = await jobForViewer(db, viewer, jobId)
  assertEditable(job)
  const file = await db('job_files').where({ id: fileId, job_id: jobId }).whereNull('removed_at').first()
  if (!file) throw new NotFound('No such file in this job.')
  const stored = await analyseAndStore(db, job, upload, viewer)
  return db.transaction(async (trx) => {
    await assertStillEditable(trx, jobId, false)
    const latest = await trx('file_revisions').where({ job_file_id: fileId }).max<{ n: number }[]>({ n: 'revision' }).first()
    const revision = Number(latest?.n ?? 0) + 1
    await insertRevision(trx, fileId, revision, upload, viewer.id, stored)
    await trx('jobs').where({ id: jobId }).update({ updated_at: nowIso() })
    return revision
  })
}

export async function setJobFileQuantity(db: Knex, viewer: SessionUser, jobId: number, fileId: number, quantity: number): Promise<void> {
  const job = await jobForViewer(db, viewer, jobId)
  assertEditable(job)
  const changed = await db('job_files').where({ id: fileId, job_id: jobId }).whereNull('removed_at').update({ quantity, updated_at: nowIso() })
  if (changed === 0) throw new NotFound('No such file in this job.')
}

/** Takes a file out of the job; its revisions stay in the database as history. */
export async function removeJobFile(db: Knex, viewer: SessionUser, jobId: number, fileId: number): Promise<void> {
  const job = await jobForViewer(db, viewer, jobId)
  assertEditable(job)
  const changed = await db('job_files').where({ id: fileId, job_id: jobId }).whereNull('removed_at').update({ removed_at: nowIso(), updated_at: nowIso() })
  if (changed === 0) throw new NotFound('No such file in this job.')
}
