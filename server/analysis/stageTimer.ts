/** The engine's stages in the order they run, as the benchmark reports them. */
export type AnalysisStage = 'parse' | 'read' | 'flatten' | 'chain' | 'measure' | 'checks' | 'time' | 'result'

export type StageTimeListener = (stage: AnalysisStage, elapsedMs: number) => void

/** A lap function: each call reports the wall time since the previous one; without a listener it does nothing. */
export function stageTimer(listener: StageTimeListener | undefined): (stage: AnalysisStage) => void {
  if (!listener) return () => {}
  let lastMs = performance.now()
  return (stage) => {
    const nowMs = performance.now()
    listener(stage, nowMs - lastMs)
    lastMs = nowMs
  }
}
