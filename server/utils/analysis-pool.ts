import { existsSync } from 'node:fs'
import { availableParallelism } from 'node:os'
import { dirname, join, resolve } from 'node:path'
import { pathToFileURL } from 'node:url'
import { MessageChannel } from 'node:worker_threads'
import Piscina from 'piscina'
import type { AnalysisParams, AnalysisResult, CutFileFormat } from '../analysis/index'
import type { SheetTask } from '../analysis/sheetSvg'
import type { AnalysisTask, WorkerMessage } from '../workers/analysis.worker'
import { analysisRole, runInQueue, sendsToQueue } from './analysis-remote'
import { useDb } from './db'
import { DomainError, TooManyRequests } from './errors'

/** The engine's figures plus the gzip-compressed packed preview geometry and finding sites (shared/packed-analysis.ts). */
export interface PackedAnalysis {
  result: Omit<AnalysisResult, 'sites'>
  geometryGz: Uint8Array
  sitesGz: Uint8Array
}

/** One member's analyses: `ahead` counts the waiting files (anyone's) that start before this one. */
export interface AnalysisQueueStatus {
  waiting: { label: string; ahead: number }[]
  running: { label: string; stage: string | null; runningMs: number }[]
}

/** What a task runner is handed: abort when `signal` fires, report each stage as it starts. */
export interface TaskControl {
  signal: AbortSignal
  onStage: (stage: string) => void
}

export type TaskRunner<Input, Output> = (input: Input, control: TaskControl) => Promise<Output>

export interface FairQueueOptions {
  /** Tasks running at once: one per worker thread. */
  threads: number
  /** Heavy tasks running at once; fewer than `threads` keeps a thread for light files. */
  heavyThreads: number
  /** Longest a task may run, counted from when a thread takes it (waiting does not count). */
  runningLimitMs: number
  /** Files one owner may have waiting; more are refused. */
  maxWaitingPerOwner: number
}

interface Entry<Input, Output> {
  ownerKey: string
  label: string
  input: Input
  heavy: boolean
  resolve: (output: Output) => void
  reject: (error: unknown) => void
  stage: string | null
  startedMs: number
  controller: AbortController
  settled: boolean
}

const tooLongError = () =>
  new DomainError('This file takes too long to analyse. Simplify it (fewer nodes, no hidden objects) or split it into several files.', 422, { kind: 'timeout' })
const outOfMemoryError = () =>
  new DomainError('This file needs more memory to analyse than the workshop allows. Simplify it or split it into several files.', 422, { kind: 'outOfMemory' })

/**
 * The analyses waiting for a worker thread, in front of the pool so that the order is ours.
 *
 * Policy: each owner (a member) has a FIFO queue of their own, and the owners take turns. An owner
 * joins the back of the round when their first file arrives and again each time one of their files
 * finishes. A free thread takes the first file of the first owner in the round whose head file can
 * start, where owners with nothing running come before owners with a file running: a member's second
 * analysis runs only on a thread that no other member's waiting file could take. A heavy file (a large
 * upload) starts only while fewer than `heavyThreads` heavy ones run, so light files always have a
 * thread and never wait behind heavy ones; a heavy file at the head of its owner's queue is passed
 * over, its owner's later files are not reordered. The running limit starts when a thread takes the
 * file: time spent waiting never counts against it.
 */
export class FairQueue<Input, Output> {
  private readonly waiting = new Map<string, Entry<Input, Output>[]>()
  private readonly running = new Set<Entry<Input, Output>>()
  /** When each owner with files waiting or running last joined the back of the round. */
  private readonly joined = new Map<string, number>()
  private joins = 0

  constructor(
    private readonly runTask: TaskRunner<Input, Output>,
    private readonly options: FairQueueOptions,
  ) {}

  submit(task: { ownerKey: string; label: string; input: Input; heavy: boolean; signal?: AbortSignal }): Promise<Output> {
    const queue = this.waiting.get(task.ownerKey) ?? []
    if (queue.length >= this.options.maxWaitingPerOwner) {
      return Promise.reject(new TooManyRequests(`You have ${queue.length} files waiting to be analysed; send more once they are done.`, 30))
    }
    if (task.signal?.aborted) return Promise.reject(task.signal.reason)
    return new Promise<Output>((resolve, reject) => {
      const entry: Entry<Input, Output> = { ...task, resolve, reject, stage: null, startedMs: 0, controller: new AbortController(), settled: false }
      task.signal?.addEventListener('abort', () => this.cancel(entry, task.signal!.reason), { once: true })
      if (!this.joined.has(task.ownerKey)) this.joined.set(task.ownerKey, ++this.joins)
      queue.push(entry)
      this.waiting.set(task.ownerKey, queue)
      this.pump()
    })
  }

  statusFor(ownerKey: string): AnalysisQueueStatus {
    const owners = this.round()
    const place = owners.findIndex(([owner]) => owner === ownerKey)
    // The k-th waiting file of an owner starts in round k: after k files of every owner (or all
    // they have) and, in that round, one of each owner ahead in the round who has more than k.
    const waiting = (this.waiting.get(ownerKey) ?? []).map((entry, k) => ({
      label: entry.label,
      ahead: owners.reduce((sum, [, queue], i) => sum + Math.min(queue.length, i < place ? k + 1 : k), 0),
    }))
    const running = [...this.running]
      .filter((entry) => entry.ownerKey === ownerKey)
      .map((entry) => ({ label: entry.label, stage: entry.stage, runningMs: Date.now() - entry.startedMs }))
    return { waiting, running }
  }

  /** Owners with files waiting, in the order they are served: nothing running first, then by when they joined. */
  private round(): [string, Entry<Input, Output>[]][] {
    const busy = new Set([...this.running].map((entry) => entry.ownerKey))
    return [...this.waiting].sort(([a], [b]) => Number(busy.has(a)) - Number(busy.has(b)) || this.joined.get(a)! - this.joined.get(b)!)
  }

  private pump(): void {
    while (this.running.size < this.options.threads) {
      const next = this.takeNext()
      if (!next) return
      this.start(next)
    }
  }

  private takeNext(): Entry<Input, Output> | undefined {
    const heavyRunning = [...this.running].filter((entry) => entry.heavy).length
    for (const [owner, queue] of this.round()) {
      const head = queue[0]!
      if (head.heavy && heavyRunning >= this.options.heavyThreads) continue
      queue.shift()
      if (queue.length === 0) this.waiting.delete(owner)
      return head
    }
    return undefined
  }

  /** After a file of the owner ends: to the back of the round (`finished`), or out of it with nothing left. */
  private rejoin(ownerKey: string, finished: boolean): void {
    const active = this.waiting.has(ownerKey) || [...this.running].some((entry) => entry.ownerKey === ownerKey)
    if (!active) this.joined.delete(ownerKey)
    else if (finished) this.joined.set(ownerKey, ++this.joins)
  }

  private start(entry: Entry<Input, Output>): void {
    this.running.add(entry)
    entry.startedMs = Date.now()
    const timer = setTimeout(() => {
      this.settle(entry, () => entry.reject(tooLongError()))
      entry.controller.abort()
    }, this.options.runningLimitMs)
    timer.unref?.()
    new Promise<Output>((resolve) => resolve(this.runTask(entry.input, { signal: entry.controller.signal, onStage: (stage) => (entry.stage = stage) })))
      .then(
        (output) => this.settle(entry, () => entry.resolve(output)),
        (error) => this.settle(entry, () => entry.reject(error)),
      )
      .finally(() => {
        // The thread is free only once the runner has let go of it (an abort ends the worker first).
        clearTimeout(timer)
        this.running.delete(entry)
        this.rejoin(entry.ownerKey, true)
        this.pump()
      })
  }

  /** The caller hears once: from the runner, the running limit or its own abort, whichever is first. */
  private settle(entry: Entry<Input, Output>, tell: () => void): void {
    if (entry.settled) return
    entry.settled = true
    tell()
  }

  private cancel(entry: Entry<Input, Output>, reason: unknown): void {
    const queue = this.waiting.get(entry.ownerKey)
    const index = queue?.indexOf(entry) ?? -1
    if (index >= 0) {
      queue!.splice(index, 1)
      if (queue!.length === 0) this.waiting.delete(entry.ownerKey)
      this.rejoin(entry.ownerKey, false)
    } else if (this.running.has(entry)) {
      entry.controller.abort()
    }
    this.settle(entry, () => entry.reject(reason))
  }
}

// Longest a single file may run, and the memory one analysis may use, before it is refused.
const RUNNING_LIMIT_MS = 60_000
const WORKER_HEAP_MB = 768
// Uploads from this size on count as heavy (a 1 MB fold pattern takes under a second alone).
const HEAVY_TEXT_CHARS = 1_000_000
const MAX_WAITING_PER_OWNER = 10

// One thread per core, heavy files on all but one: on two cores one heavy file runs at a time next to one
// light file. Measured with four 6.7 MB uploads at once and the calendar read in a loop: two heavy at a time
// (three threads) ended all four 30 % sooner but raised the peak RSS from 0.87 to 1.3 GB and the calendar's
// p99 from 181 to 257 ms, as the request thread lost its share of a core.
const THREADS = Math.max(2, availableParallelism())

interface WorkerInput {
  text: string
  params: AnalysisParams
  format?: CutFileFormat
  label?: string
}

let pool: Piscina | undefined

function workerFile(): string {
  const candidates = [join(dirname(process.argv[1] ?? ''), 'analysis-worker.mjs'), resolve('.nuxt/analysis-worker.mjs')]
  const found = candidates.find((path) => existsSync(path))
  if (!found) throw new Error(`The analysis worker bundle is missing (looked in ${candidates.join(', ')}); run nuxt build or nuxt dev.`)
  return pathToFileURL(found).href
}

function analysisPool(): Piscina {
  if (pool) return pool
  pool = new Piscina({
    filename: workerFile(),
    minThreads: 0,
    maxThreads: THREADS,
    // Idle workers leave soon, handing a big analysis's memory back to the system.
    idleTimeout: 5_000,
    resourceLimits: { maxOldGenerationSizeMb: WORKER_HEAP_MB },
  })
  // A worker that dies between tasks has nobody to tell; without a listener the process would crash.
  pool.on('error', (error) => console.error('[analysis worker]', error))
  return pool
}

/** Runs one analysis on a worker thread; the outcome and its stages come back on a port of its own. */
function runInWorker(input: WorkerInput, control: TaskControl): Promise<PackedAnalysis> {
  const { port1, port2 } = new MessageChannel()
  return new Promise<PackedAnalysis>((resolve, reject) => {
    port1.on('message', (message: WorkerMessage) => {
      if ('stage' in message) return control.onStage(message.stage)
      port1.close()
      const { outcome } = message
      if (outcome.ok) resolve({ result: outcome.result, geometryGz: outcome.geometryGz, sitesGz: outcome.sitesGz })
      else reject(new DomainError(outcome.message, outcome.status, { kind: outcome.kind }))
    })
    const task: AnalysisTask = { ...input, port: port2 }
    analysisPool()
      // piscina types its transfer list from postMessage's other overload; a list of ports is what it passes on.
      .run(task, { transferList: [port2] as never, signal: control.signal })
      .catch((error: unknown) => {
        port1.close()
        reject((error as { code?: string }).code === 'ERR_WORKER_OUT_OF_MEMORY' ? outOfMemoryError() : error)
      })
  })
}

/** On a worker thread here, or on a worker machine through the database (ANALYSIS_ROLE=queue, analysis-remote.ts). */
function runAnalysis(input: WorkerInput, control: TaskControl): Promise<PackedAnalysis> {
  return sendsToQueue(useDb()) ? runInQueue(useDb(), input, control) : runInWorker(input, control)
}

// An app server that hands its analyses to worker servers (ANALYSIS_ROLE=queue) keeps as many in flight as
// ANALYSIS_QUEUE_TASKS says (the workers' capacity), not as many as its own cores; heavy files on all but one.
const IN_FLIGHT = analysisRole() === 'queue' ? Math.max(2, Number(process.env.ANALYSIS_QUEUE_TASKS) || THREADS) : THREADS

const analysisQueue = new FairQueue<WorkerInput, PackedAnalysis>(runAnalysis, {
  threads: IN_FLIGHT,
  heavyThreads: IN_FLIGHT - 1,
  runningLimitMs: RUNNING_LIMIT_MS,
  maxWaitingPerOwner: MAX_WAITING_PER_OWNER,
})

/** Whose turn an analysis is: one key per member. */
export function analysisOwnerKey(user: { id: number }): string {
  return `user:${user.id}`
}

/**
 * Analyses a cut file on a worker thread, in turn with everyone else's (see FairQueue): `ownerKey`
 * names whose turn it is (analysisOwnerKey), `label` is what the owner's queue status shows.
 */
export function analyzeInWorker(
  text: string,
  params: AnalysisParams,
  options: { ownerKey: string; format?: CutFileFormat; label?: string; signal?: AbortSignal },
): Promise<PackedAnalysis> {
  return analysisQueue.submit({
    ownerKey: options.ownerKey,
    label: options.label ?? 'file',
    input: { text, params, format: options.format, label: options.label },
    heavy: text.length >= HEAVY_TEXT_CHARS,
    signal: options.signal,
  })
}

/**
 * A stock sheet of a job as SVG for the cutter (server/analysis/sheetSvg.ts), drawn on a worker thread: reading a
 * large original takes a good part of a second. Staff ask for it one sheet at a time, so it goes straight to the
 * pool rather than through the members' turn order.
 */
export function drawSheetInWorker(task: SheetTask): Promise<string> {
  return analysisPool().run(task, { name: 'drawSheetSvg' }) as Promise<string>
}

/** The owner's own waiting and running analyses, for the upload page. */
export function analysisQueueFor(ownerKey: string): AnalysisQueueStatus {
  return analysisQueue.statusFor(ownerKey)
}
