import type { AnalysisParams } from '../params'

/** Seconds to cut a length at the process's cut speed (no acceleration: a lower bound). */
export function cutTimeS(lengthMm: number, params: AnalysisParams): number {
  return lengthMm / (params.cutSpeedMmPerMin / 60)
}
