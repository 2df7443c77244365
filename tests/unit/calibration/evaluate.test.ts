import { describe, expect, it } from 'vitest'
import { holdOutError } from '../../../server/services/calibration/evaluate'
import { fitTimeCorrection } from '../../../server/services/calibration/fit'
import { type TimeSample, UNCORRECTED } from '../../../server/services/calibration/model'
import { nearestRankPercentile } from '../../../server/services/calibration/statistics'
import { generateJobs, HIDDEN } from './jobs'

const fitCoefficients = (training: readonly TimeSample[]) => fitTimeCorrection(training).coefficients

describe('nearestRankPercentile', () => {
  it('matches the worked nearest-rank example for 15, 20, 35, 40, 50 (textbook example, from memory)', () => {
    const values = [50, 15, 40, 20, 35]
    expect(nearestRankPercentile(values, 5)).toBe(15)
    expect(nearestRankPercentile(values, 30)).toBe(20)
    expect(nearestRankPercentile(values, 40)).toBe(20)
    expect(nearestRankPercentile(values, 50)).toBe(35)
    expect(nearestRankPercentile(values, 100)).toBe(50)
  })

  it('takes rank ⌈0.9·n⌉ for the 90th percentile and the lower middle for an even median', () => {
    const oneToTwenty = Array.from({ length: 20 }, (_, index) => index + 1)
    expect(nearestRankPercentile(oneToTwenty, 90)).toBe(18)
    expect(nearestRankPercentile([4, 1, 3, 2], 50)).toBe(2)
  })
})

describe('holdOutError', () => {
  it('on jobs all 25 % slower than modelled, with no setup or noise, is 20 % before and 0 % after (by hand: |1 − 1.25| / 1.25)', () => {
    const jobs = generateJobs({ count: 16, seed: 21, hidden: { cut: 1.25, pierce: 1.25, travel: 1.25 }, roundToMinutes: false }).map((job) => ({
      ...job,
      setupS: 0,
      actualS: job.actualS - job.setupS,
    }))
    const error = holdOutError(jobs, fitCoefficients, 4)!
    expect(error.uncorrected.medianPercent).toBeCloseTo(20, 9)
    expect(error.uncorrected.p90Percent).toBeCloseTo(20, 9)
    expect(error.corrected.medianPercent).toBeCloseTo(0, 6)
    expect(error.corrected.p90Percent).toBeCloseTo(0, 6)
  })

  it('shrinks after calibration on noisy jobs with a hidden correction, down to about the noise', () => {
    const jobs = generateJobs({ count: 120, seed: 22, hidden: HIDDEN, relativeNoise: 0.04 })
    const error = holdOutError(jobs, fitCoefficients, 30)!
    expect(error.corrected.medianPercent).toBeLessThan(error.uncorrected.medianPercent / 2)
    expect(error.corrected.p90Percent).toBeLessThan(error.uncorrected.p90Percent)
    // Median |N(0, σ)| is 0.674·σ (normal distribution); 4 % noise on the motion time bounds it by about 2.7 %.
    expect(error.corrected.medianPercent).toBeLessThan(4)
  })

  it('fits only on the older jobs and judges on the newest', () => {
    const jobs = generateJobs({ count: 10, seed: 23, hidden: HIDDEN })
    let trainingSeen: readonly TimeSample[] = []
    const error = holdOutError(jobs, (training) => {
      trainingSeen = training
      return UNCORRECTED
    }, 3)!
    expect(trainingSeen).toEqual(jobs.slice(0, 7))
    expect(error).toMatchObject({ trainedOn: 7, heldOut: 3 })
    expect(error.corrected).toEqual(error.uncorrected)
  })

  it('is null when nothing would be held out or nothing left to fit on', () => {
    const jobs = generateJobs({ count: 5, seed: 24, hidden: HIDDEN })
    expect(holdOutError(jobs, fitCoefficients, 0)).toBeNull()
    expect(holdOutError(jobs, fitCoefficients, 5)).toBeNull()
  })
})
