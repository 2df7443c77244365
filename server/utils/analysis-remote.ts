// Analyses on worker machines, through the database (PostgreSQL). ANALYSIS_ROLE chooses what an app server does:
//   local  (default) runs the analyses of its own uploads on its worker threads (analysis-pool.ts);
//   queue  writes each analysis as a row of `analysis_tasks` and waits for a worker to write the outcome back;
//   worker runs its own uploads locally too, and takes queued tasks from the table (server/plugins/analysis-worker.ts).
// The app server keeps its fair queue (whose turn, how many at once, the running limit, the member's status); only
// the computing moves. A task is claimed with FOR UPDATE SKIP LOCKED, so each runs on one worker; a worker beats a
// heartbeat while it runs one, and a task whose worker went silent is handed out again.
import { hostname } from 'node:os'
import { setTimeout as sleep } from 'node:timers/promises'
import type { Knex } from 'knex'
import { insertedId, isPostgres, utcNowSql, utcSecondsAgoSql } from '../../db/dialect'
import type { AnalysisParams, CutFileFormat } from '../analysis/index'
import type { PackedAnalysis, TaskControl } from './analysis-pool'
import { DomainError } from './errors'
import { nowIso } from './rows'

export type AnalysisRole = 'local' | 'queue' | 'worker'

export interface RemoteTaskInput {
  text: string
  params: AnalysisParams
  format?: CutFileFormat
  label?: string
}

/** How often the waiting app server looks at its task, and a worker at the queue. */
export const POLL_MS = 100
/** A running task whose worker has not beaten its heartbeat for this long (by the database's clock) is handed out again. */
export const SILENT_WORKER_MS = 15_000

export function analysisRole(env = process.env): AnalysisRole {
  const role = env.ANALYSIS_ROLE ?? 'local'
  if (role === 'local' || role === 'queue' || role === 'worker') return role
  throw new Error(`ANALYSIS_ROLE must be local, queue or worker, not "${role}"`)
}

/** Whether this server sends its analyses to the queue: asked for, and the database is PostgreSQL. */
export function sendsToQueue(db: Knex): boolean {
  if (analysisRole() !== 'queue') return false
  if (isPostgres(db)) return true
  warnOnce('ANALYSIS_ROLE=queue needs PostgreSQL (DATABASE_URL); analysing on this server instead.')
  return false
}

let warned = false
function warnOnce(message: string): void {
  if (!warned) console.warn(`[analysis] ${message}`)
  warned = true
}

/** This worker's name in `claimed_by`: the host and the process. */
export const workerName = () => `${hostname()}:${process.pid}`

/**
 * Writes the analysis as a task and waits for a worker's outcome: the figures and packed geometry, or the refusal
 * the engine gave (the same 4xx a local analysis gives). Aborting (the member left, the running limit) deletes the
 * task; a worker still at it then finds its row gone and stops.
 */
export async function runInQueue(db: Knex, input: RemoteTaskInput, control: TaskControl): Promise<PackedAnalysis> {
  const id = await insertedId(
    db('analysis_tasks').insert({ label: input.label ?? 'file', input_text: input.text, params_json: JSON.stringify({ params: input.params, format: input.format }) }),
  )
  try {
    for (;;) {
      control.signal.throwIfAborted()
      const task = await db('analysis_tasks').where({ id }).first('status', 'stage')
      if (!task) throw new DomainError('The analysis was called off. Upload the file again.', 409)
      if (task.stage) control.onStage(task.stage)
      if (task.status === 'done' || task.status === 'failed') return await outcomeOf(db, id)
      if (task.status === 'running') {
        // Its worker went silent (stopped, or cut off): back in the queue for another. Heartbeats and this test
        // both read the database's clock, so machines whose clocks differ can't call a live worker silent.
        await db('analysis_tasks')
          .where({ id, status: 'running' })
          .where('heartbeat_at', '<', db.raw(utcSecondsAgoSql(db, SILENT_WORKER_MS / 1000)))
          .update({ status: 'queued', claimed_by: null, stage: null, updated_at: nowIso() })
      }
      await sleep(POLL_MS, undefined, { signal: control.signal }).catch(() => undefined)
    }
  } finally {
    await db('analysis_tasks').where({ id }).del()
  }
}

async function outcomeOf(db: Knex, id: number): Promise<PackedAnalysis> {
  const row = await db('analysis_tasks').where({ id }).first('status', 'result_json', 'geometry_gz', 'sites_gz', 'error_json')
  if (row.status === 'failed') {
    const error = JSON.parse(row.error_json) as { message: string; status: number; details?: Record<string, unknown> }
    throw new DomainError(error.message, error.status, error.details)
  }
  return { result: JSON.parse(row.result_json), geometryGz: new Uint8Array(row.geometry_gz), sitesGz: new Uint8Array(row.sites_gz) }
}

export interface ClaimedTask {
  id: number
  label: string
  input: RemoteTaskInput
}

/** Takes the oldest queued task for this worker, or none; two workers never take the same one. */
export async function claimTask(db: Knex, worker = workerName()): Promise<ClaimedTask | undefined> {
  const { rows } = await db.raw<{ rows: { id: number; label: string; input_text: string; params_json: string }[] }>(
    `UPDATE analysis_tasks SET status = 'running', claimed_by = ?, heartbeat_at = ${utcNowSql(db)}, updated_at = ?
     WHERE id = (SELECT id FROM analysis_tasks WHERE status = 'queued' ORDER BY id LIMIT 1 FOR UPDATE SKIP LOCKED)
     RETURNING id, label, input_text, params_json`,
    [worker, nowIso()],
  )
  const row = rows[0]
  if (!row) return undefined
  const { params, format } = JSON.parse(row.params_json) as { params: AnalysisParams; format?: CutFileFormat }
  return { id: row.id, label: row.label, input: { text: row.input_text, params, format, label: row.label } }
}

/** The worker's heartbeat and current stage; false when the task is gone or no longer this worker's (stop it). */
export async function beat(db: Knex, id: number, stage: string | null, worker = workerName()): Promise<boolean> {
  const updated = await db('analysis_tasks').where({ id, status: 'running', claimed_by: worker }).update({ heartbeat_at: db.raw(utcNowSql(db)), stage })
  return updated === 1
}

/** Writes a task's outcome, if the task is still this worker's. */
export async function finishTask(db: Knex, id: number, outcome: { ok: PackedAnalysis } | { error: unknown }, worker = workerName()): Promise<void> {
  const written =
    'ok' in outcome
      ? { status: 'done', result_json: JSON.stringify(outcome.ok.result), geometry_gz: Buffer.from(outcome.ok.geometryGz), sites_gz: Buffer.from(outcome.ok.sitesGz) }
      : { status: 'failed', error_json: JSON.stringify(refusalOf(outcome.error)) }
  await db('analysis_tasks')
    .where({ id, status: 'running', claimed_by: worker })
    .update({ ...written, updated_at: nowIso() })
}

/** Tasks no app server waits for any more (it stopped while waiting): older than any analysis may run. */
export const ABANDONED_TASK_MS = 10 * 60_000

/** Deletes abandoned tasks (a background duty); answers how many. */
export async function sweepAbandonedTasks(db: Knex, now = Date.now()): Promise<number> {
  return db('analysis_tasks').where('created_at', '<', new Date(now - ABANDONED_TASK_MS).toISOString()).del()
}

/** What the member is told: the engine's own refusal, or a plain failure without the worker's internals. */
function refusalOf(error: unknown): { message: string; status: number; details?: Record<string, unknown> } {
  if (error instanceof DomainError) return { message: error.message, status: error.status, details: error.details }
  console.error('[analysis worker] task failed:', error)
  return { message: 'The analysis failed on the worker. Try again; if it fails again, tell the staff.', status: 500 }
}
