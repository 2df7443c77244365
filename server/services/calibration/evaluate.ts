import { applyCorrection, type ComponentCoefficients, isUsableSample, type TimeSample, UNCORRECTED } from './model'
import { nearestRankPercentile } from './statistics'

/** Absolute percentage error |estimate − actual| / actual · 100 over a set of jobs. */
export interface PercentageError {
  medianPercent: number
  p90Percent: number
}

export interface HoldOutError {
  /** Older jobs the correction was fitted on. */
  trainedOn: number
  /** Most recent jobs it was judged on. */
  heldOut: number
  uncorrected: PercentageError
  corrected: PercentageError
}

/**
 * Fits on all but the `holdOutCount` most recent jobs and measures both the engine's own estimate and
 * the corrected one on those recent jobs, so "before → after" is measured on jobs the fit never saw.
 * Samples must be sorted oldest first; unusable ones (see isUsableSample) are skipped, so no error
 * divides by a zero actual time. Percentiles are nearest-rank (see nearestRankPercentile).
 * Null when there is nothing to hold out or nothing left to fit on.
 */
export function holdOutError(
  samplesOldestFirst: readonly TimeSample[],
  fit: (training: readonly TimeSample[]) => ComponentCoefficients,
  holdOutCount: number,
): HoldOutError | null {
  const usable = samplesOldestFirst.filter(isUsableSample)
  const holdOut = Math.floor(holdOutCount)
  if (holdOut < 1 || holdOut >= usable.length) return null
  const training = usable.slice(0, usable.length - holdOut)
  const recent = usable.slice(usable.length - holdOut)
  const coefficients = fit(training)
  return {
    trainedOn: training.length,
    heldOut: recent.length,
    uncorrected: percentageError(recent, UNCORRECTED),
    corrected: percentageError(recent, coefficients),
  }
}

export function percentageError(samples: readonly TimeSample[], coefficients: ComponentCoefficients): PercentageError {
  const errorsPercent = samples.map((sample) => (Math.abs(applyCorrection(sample, coefficients) - sample.actualS) / sample.actualS) * 100)
  return { medianPercent: nearestRankPercentile(errorsPercent, 50), p90Percent: nearestRankPercentile(errorsPercent, 90) }
}
