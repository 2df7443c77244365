import { type FitModel, type FitOptions, fitTimeCorrection } from './fit'
import { type HoldOutError, holdOutError } from './evaluate'
import { type ComponentCoefficients, isUsableSample, type TimeSample } from './model'

export { applyCorrection, isUsableSample, UNCORRECTED } from './model'
export type { ComponentCoefficients, CorrectedComponent, TimeComponents, TimeSample } from './model'
export { fitTimeCorrection } from './fit'
export type { FitModel, FitOptions, TimeCorrectionFit } from './fit'
export { holdOutError, percentageError } from './evaluate'
export type { HoldOutError, PercentageError } from './evaluate'

/** A finished job with the time it finished (jobs.cut_finished_at, ISO 8601 UTC). */
export interface DatedTimeSample extends TimeSample {
  finishedAt: string
}

/** A finished job tagged with what it was cut on. */
export interface CutterTimeSample extends DatedTimeSample {
  cutterId: number
  materialFamily: string
}

export interface CorrectionOptions {
  /** Fewer usable jobs than this give no correction at all. */
  minSamples?: number
  fit?: FitOptions
}

export interface TimeCorrection {
  coefficients: ComponentCoefficients
  model: FitModel
  /** Jobs the coefficients were fitted on: "calibrated on 24 jobs". */
  calibratedOn: number
  /** Error before and after on the most recent jobs, fitted without them; null when too few to split. */
  holdOut: HoldOutError | null
}

export const DEFAULT_MIN_SAMPLES = 8
// A quarter of the jobs judge the fit: enough recent jobs to measure, most of the history left to learn from.
const HOLD_OUT_SHARE = 0.25

/**
 * The correction for one group of finished jobs, or null below minSamples usable jobs. The returned
 * coefficients are fitted on every usable job; the hold-out error refits without the newest quarter.
 */
export function correctionFor(samples: readonly DatedTimeSample[], options: CorrectionOptions = {}): TimeCorrection | null {
  // Even with minSamples 0, an empty group has nothing to calibrate on.
  const minSamples = Math.max(1, options.minSamples ?? DEFAULT_MIN_SAMPLES)
  const usableOldestFirst = samples.filter(isUsableSample).sort((a, b) => finishedAtMs(a) - finishedAtMs(b))
  if (usableOldestFirst.length < minSamples) return null
  const fit = fitTimeCorrection(usableOldestFirst, options.fit)
  const holdOutCount = Math.max(1, Math.floor(usableOldestFirst.length * HOLD_OUT_SHARE))
  return {
    coefficients: fit.coefficients,
    model: fit.model,
    calibratedOn: fit.usedSamples,
    holdOut: holdOutError(usableOldestFirst, (training) => fitTimeCorrection(training, options.fit).coefficients, holdOutCount),
  }
}

// An unreadable finish time sorts as oldest, so it can never become one of the held-out recent jobs.
function finishedAtMs(sample: DatedTimeSample): number {
  const ms = Date.parse(sample.finishedAt)
  return Number.isNaN(ms) ? Number.MIN_SAFE_INTEGER : ms
}

export type CalibrationScope = 'cutter-and-family' | 'cutter'

/**
 * Which finished jobs calibrate an estimate for `target`: the cutter's jobs in the same material family
 * when that group alone has at least minSamples usable jobs (a family can cut differently, say acrylic
 * against plywood on one laser); otherwise all of the cutter's jobs. Other cutters never count: each
 * machine's drift is its own. The group returned may still be too small for correctionFor.
 */
export function chooseCalibrationGroup<Sample extends CutterTimeSample>(
  samples: readonly Sample[],
  target: { cutterId: number; materialFamily: string },
  minSamples: number = DEFAULT_MIN_SAMPLES,
): { scope: CalibrationScope; samples: Sample[] } {
  const cutterSamples = samples.filter((sample) => sample.cutterId === target.cutterId)
  const familySamples = cutterSamples.filter((sample) => sample.materialFamily === target.materialFamily)
  if (familySamples.filter(isUsableSample).length >= minSamples) return { scope: 'cutter-and-family', samples: familySamples }
  return { scope: 'cutter', samples: cutterSamples }
}
