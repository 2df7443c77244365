import { existsSync } from 'node:fs'
import { availableParallelism } from 'node:os'
import { dirname, join, resolve } from 'node:path'
import { pathToFileURL } from 'node:url'
import Piscina from 'piscina'
import type { AnalysisParams, AnalysisResult, AnalyzeOptions } from '../analysis/index'
import type { AnalysisOutcome } from '../workers/analysis.worker'
import { DomainError } from './errors'

// Longest a single file may take, and the memory one analysis may use, before it is refused.
const ANALYSIS_TIMEOUT_MS = 60_000
const WORKER_HEAP_MB = 768

let pool: Piscina | undefined

function workerFile(): string {
  const candidates = [join(dirname(process.argv[1] ?? ''), 'analysis-worker.mjs'), resolve('.nuxt/analysis-worker.mjs')]
  const found = candidates.find((path) => existsSync(path))
  if (!found) throw new Error(`The analysis worker bundle is missing (looked in ${candidates.join(', ')}); run nuxt build or nuxt dev.`)
  return pathToFileURL(found).href
}

function analysisPool(): Piscina {
  pool ??= new Piscina({
    filename: workerFile(),
    minThreads: 0,
    maxThreads: Math.max(1, availableParallelism() - 1),
    // Idle workers leave soon, handing a big analysis's memory back to the system.
    idleTimeout: 5_000,
    resourceLimits: { maxOldGenerationSizeMb: WORKER_HEAP_MB },
  })
  return pool
}

/** Runs the engine in a worker thread so a large file never blocks other requests. */
export async function analyzeInWorker(svgText: string, params: AnalysisParams, options: AnalyzeOptions = {}): Promise<AnalysisResult> {
  let outcome: AnalysisOutcome
  try {
    outcome = await analysisPool().run({ svgText, params, options }, { signal: AbortSignal.timeout(ANALYSIS_TIMEOUT_MS) })
  } catch (error) {
    const name = (error as Error).name
    if (name === 'AbortError' || name === 'TimeoutError') {
      throw new DomainError('This file takes too long to analyse. Simplify it (fewer nodes, no hidden objects) or split it into several files.', 422)
    }
    if (/memory|heap/i.test((error as Error).message)) {
      throw new DomainError('This file needs more memory to analyse than the workshop allows. Simplify it or split it into several files.', 422)
    }
    throw error
  }
  if (!outcome.ok) throw new DomainError(outcome.message, outcome.status, { kind: outcome.kind })
  return outcome.result
}
