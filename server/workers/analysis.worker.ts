// Worker-thread entry for the cut-file engine: big files are analysed here, off the request thread.
// Bundled to analysis-worker.mjs by modules/analysis-worker.ts; errors come back as plain data.
import { AnalysisInputError, analyzeCutFile, type AnalysisParams, type AnalysisResult, type AnalyzeOptions, type CutFileFormat } from '../analysis/index'

export interface AnalysisTask {
  /** SVG or DXF text; `options.format` names it, or its content decides. */
  svgText: string
  params: AnalysisParams
  options: AnalyzeOptions & { format?: CutFileFormat }
}

export type AnalysisOutcome =
  | { ok: true; result: AnalysisResult }
  | { ok: false; status: number; kind: string; message: string }

export default function runAnalysis(task: AnalysisTask): AnalysisOutcome {
  try {
    return { ok: true, result: analyzeCutFile(task.svgText, task.params, task.options) }
  } catch (error) {
    if (error instanceof AnalysisInputError) return { ok: false, status: error.status, kind: error.kind, message: error.message }
    throw error
  }
}
