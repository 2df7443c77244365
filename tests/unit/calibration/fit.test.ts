import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { fitTimeCorrection } from '../../../server/services/calibration/fit'
import { applyCorrection, type ComponentCoefficients, type CorrectedComponent, modelledMotionS, type TimeSample } from '../../../server/services/calibration/model'
import { generateJobs, HIDDEN, maxRelativeDifference, SETUP_S } from './jobs'

type Vector3 = [number, number, number]

// Determinant of a 3×3 matrix by the rule of Sarrus (standard linear algebra, from memory).
function determinant3(m: [Vector3, Vector3, Vector3]): number {
  return (
    m[0][0] * m[1][1] * m[2][2] + m[0][1] * m[1][2] * m[2][0] + m[0][2] * m[1][0] * m[2][1] -
    m[0][2] * m[1][1] * m[2][0] - m[0][0] * m[1][2] * m[2][1] - m[0][1] * m[1][0] * m[2][2]
  )
}

/**
 * Independent reference, no matrix library: least squares of (actual − setup) on the three components
 * with row weight `weightOf`, through the normal equations XᵀWX·β = XᵀWy (Gauss/Legendre) solved by
 * Cramer's rule (from memory).
 */
function normalEquationsFit(samples: readonly TimeSample[], weightOf: (sample: TimeSample) => number): ComponentCoefficients {
  const normal: [Vector3, Vector3, Vector3] = [[0, 0, 0], [0, 0, 0], [0, 0, 0]]
  const right: Vector3 = [0, 0, 0]
  for (const sample of samples) {
    const row: Vector3 = [sample.cutS, sample.pierceS, sample.travelS]
    const weight = weightOf(sample)
    row.forEach((rowValue, i) => {
      right[i]! += weight * rowValue * (sample.actualS - sample.setupS)
      row.forEach((columnValue, j) => (normal[i]![j]! += weight * rowValue * columnValue))
    })
  }
  const whole = determinant3(normal)
  const solved = [0, 1, 2].map(
    (column) => determinant3(normal.map((row, i) => row.map((value, j) => (j === column ? right[i]! : value))) as [Vector3, Vector3, Vector3]) / whole,
  )
  return { cut: solved[0]!, pierce: solved[1]!, travel: solved[2]! }
}

// The fit weighs residuals relative to the modelled motion time, i.e. row weight 1/m².
const relativeWeight = (sample: TimeSample) => 1 / modelledMotionS(sample) ** 2

// Source: the generator's hidden coefficients. Pierce carries the least time, so it is the least
// certain; each tolerance is at least 3 times the root-mean-square error of the estimate over 200 seeds of the same generator.
const RECOVERY_TOLERANCE: ComponentCoefficients = { cut: 0.02, pierce: 0.05, travel: 0.03 }

function expectRecovered(found: ComponentCoefficients, hidden: ComponentCoefficients, components: CorrectedComponent[] = ['cut', 'pierce', 'travel']): void {
  for (const component of components) expect(Math.abs(found[component] / hidden[component] - 1)).toBeLessThan(RECOVERY_TOLERANCE[component])
}

/** The largest relative change in any job's corrected estimate between two sets of coefficients. */
function largestEstimateShift(jobs: readonly TimeSample[], from: ComponentCoefficients, to: ComponentCoefficients): number {
  return Math.max(...jobs.map((job) => Math.abs(applyCorrection(job, to) / applyCorrection(job, from) - 1)))
}

describe('fitTimeCorrection', () => {
  it('recovers a hidden correction within a few per cent from 300 jobs with 3 % noise logged in whole minutes', () => {
    const jobs = generateJobs({ count: 300, seed: 11, hidden: HIDDEN, relativeNoise: 0.03 })
    const fit = fitTimeCorrection(jobs)
    expect(fit.model).toBe('components')
    expect(fit.usedSamples).toBe(300)
    expect(fit.converged).toBe(true)
    expectRecovered(fit.coefficients, HIDDEN)
  })

  it('without robust weighting equals weighted least squares from the normal equations by Cramer’s rule', () => {
    const jobs = generateJobs({ count: 60, seed: 12, hidden: HIDDEN, relativeNoise: 0.05 })
    const fit = fitTimeCorrection(jobs, { huberTuning: Number.POSITIVE_INFINITY })
    const reference = normalEquationsFit(jobs, relativeWeight)
    expect(maxRelativeDifference(fit.coefficients, reference)).toBeLessThan(1e-9)
  })

  it('on clean data gives every job an estimate within 1.5 % of the least-squares reference (Huber loses little when errors are normal)', () => {
    const jobs = generateJobs({ count: 100, seed: 13, hidden: HIDDEN, relativeNoise: 0.04, roundToMinutes: false })
    expect(largestEstimateShift(jobs, normalEquationsFit(jobs, relativeWeight), fitTimeCorrection(jobs).coefficients)).toBeLessThan(0.015)
  })

  it('satisfies Huber’s estimating equations Σ ψ(r/s)·x = 0 at its answer (Huber 1964, ψ(u) = max(−k, min(k, u)))', () => {
    const jobs = generateJobs({ count: 80, seed: 14, hidden: HIDDEN, relativeNoise: 0.05 })
    jobs[5]!.actualS *= 4
    const huberTuning = 1.345
    const fit = fitTimeCorrection(jobs, { huberTuning })
    const sums: Vector3 = [0, 0, 0]
    for (const job of jobs) {
      const motionS = modelledMotionS(job)
      const relativeResidual = (job.actualS - applyCorrection(job, fit.coefficients)) / motionS
      const psi = Math.max(-huberTuning, Math.min(huberTuning, relativeResidual / fit.relativeResidualScale))
      const shares = [job.cutS / motionS, job.pierceS / motionS, job.travelS / motionS]
      shares.forEach((share, index) => (sums[index]! += psi * share))
    }
    for (const sum of sums) expect(Math.abs(sum)).toBeLessThan(1e-6)
  })

  it('lets one job at ten times the model move no estimate by more than 2 %, where least squares moves a coefficient over 10 %', () => {
    const jobs = generateJobs({ count: 100, seed: 15, hidden: HIDDEN, relativeNoise: 0.04 })
    const withOutlier = jobs.map((job, index) => (index === 17 ? { ...job, actualS: 10 * applyCorrection(job, HIDDEN) } : job))
    expect(largestEstimateShift(jobs, fitTimeCorrection(jobs).coefficients, fitTimeCorrection(withOutlier).coefficients)).toBeLessThan(0.02)
    // The same outlier through the independent least-squares reference: proof that it would swing a plain fit.
    expect(maxRelativeDifference(normalEquationsFit(withOutlier, relativeWeight), normalEquationsFit(jobs, relativeWeight))).toBeGreaterThan(0.1)
  })

  it('recovers any hidden correction in range exactly from noise-free jobs', () => {
    fc.assert(
      fc.property(
        fc.record({
          cut: fc.double({ min: 0.6, max: 1.8, noNaN: true }),
          pierce: fc.double({ min: 0.6, max: 1.8, noNaN: true }),
          travel: fc.double({ min: 0.6, max: 1.8, noNaN: true }),
        }),
        fc.integer({ min: 1, max: 1_000_000 }),
        (hidden, seed) => {
          const jobs = generateJobs({ count: 12, seed, hidden, roundToMinutes: false })
          expect(maxRelativeDifference(fitTimeCorrection(jobs).coefficients, hidden)).toBeLessThan(1e-6)
        },
      ),
    )
  })

  it('never returns NaN or a coefficient outside 0.5–2.0, whatever is recorded', () => {
    const anyNumber = fc.oneof(fc.double(), fc.constant(0), fc.double({ min: 0, max: 10_000, noNaN: true }))
    const anySample = fc.record({ cutS: anyNumber, pierceS: anyNumber, travelS: anyNumber, setupS: anyNumber, actualS: anyNumber })
    fc.assert(
      fc.property(fc.array(anySample, { maxLength: 12 }), (samples) => {
        const fit = fitTimeCorrection(samples)
        for (const value of Object.values(fit.coefficients)) {
          expect(Number.isFinite(value)).toBe(true)
          expect(value).toBeGreaterThanOrEqual(0.5)
          expect(value).toBeLessThanOrEqual(2.0)
        }
      }),
    )
  })

  it('returns the model unchanged when no job is usable', () => {
    const fit = fitTimeCorrection([
      { cutS: 0, pierceS: 0, travelS: 0, setupS: 300, actualS: 600 },
      { cutS: Number.NaN, pierceS: 1, travelS: 1, setupS: 0, actualS: 60 },
    ])
    expect(fit).toMatchObject({ model: 'none', samples: 2, usedSamples: 0, coefficients: { cut: 1, pierce: 1, travel: 1 } })
  })

  it('with no travel in any job fits cut and pierce and leaves travel at 1', () => {
    const jobs = generateJobs({ count: 300, seed: 16, hidden: HIDDEN, relativeNoise: 0.03, withTravel: false })
    const fit = fitTimeCorrection(jobs)
    expect(fit.fittedComponents).toEqual(['cut', 'pierce'])
    expect(fit.coefficients.travel).toBe(1)
    expectRecovered(fit.coefficients, HIDDEN, ['cut', 'pierce'])
  })

  it('leaves a component under 2 % of the time uncorrected', () => {
    const jobs = generateJobs({ count: 30, seed: 17, hidden: HIDDEN, roundToMinutes: false }).map((job) => ({
      ...job,
      travelS: 1,
      actualS: job.actualS - HIDDEN.travel * job.travelS + HIDDEN.travel,
    }))
    const fit = fitTimeCorrection(jobs)
    expect(fit.fittedComponents).toEqual(['cut', 'pierce'])
    expect(fit.coefficients.travel).toBe(1)
  })

  it('from identical jobs fits one factor: (actual − setup) / modelled motion, worked by hand', () => {
    const job = { cutS: 600, pierceS: 100, travelS: 100, setupS: SETUP_S, actualS: 1260 }
    const fit = fitTimeCorrection([job, job, job, job, job, job, job, job])
    expect(fit.model).toBe('scale')
    // (1260 − 300) / (600 + 100 + 100) = 960 / 800
    for (const value of Object.values(fit.coefficients)) expect(value).toBeCloseTo(1.2, 12)
  })

  it('when pierce and travel are fixed shares of cut, fits one factor that reproduces every job', () => {
    const jobs = [300, 900, 1500, 2100, 2700, 3300, 3900, 4500].map((cutS) => {
      const job = { cutS, pierceS: 0.1 * cutS, travelS: 0.05 * cutS, setupS: SETUP_S }
      return { ...job, actualS: applyCorrection(job, HIDDEN) }
    })
    const fit = fitTimeCorrection(jobs)
    expect(fit.model).toBe('scale')
    // By hand: (1.12 + 0.8·0.1 + 1.3·0.05) / (1 + 0.1 + 0.05) = 1.265 / 1.15 = 1.1
    expect(fit.coefficients.cut).toBeCloseTo(1.1, 12)
    for (const job of jobs) expect(applyCorrection(job, fit.coefficients)).toBeCloseTo(job.actualS, 6)
  })

  it('with fewer than two jobs per coefficient fits one factor', () => {
    const jobs = generateJobs({ count: 5, seed: 18, hidden: { cut: 1.3, pierce: 1.3, travel: 1.3 }, roundToMinutes: false })
    const fit = fitTimeCorrection(jobs)
    expect(fit.model).toBe('scale')
    expect(fit.coefficients.cut).toBeCloseTo(1.3, 9)
  })

  it('clips coefficients to 0.5–2.0 and says which', () => {
    const slow = generateJobs({ count: 20, seed: 19, hidden: { cut: 5, pierce: 5, travel: 5 } })
    expect(fitTimeCorrection(slow)).toMatchObject({ coefficients: { cut: 2, pierce: 2, travel: 2 }, clippedComponents: ['cut', 'pierce', 'travel'] })
    const fast = generateJobs({ count: 20, seed: 20, hidden: { cut: 0.2, pierce: 1, travel: 1 }, roundToMinutes: false })
    const fit = fitTimeCorrection(fast)
    expect(fit.coefficients.cut).toBe(0.5)
    expect(fit.clippedComponents).toEqual(['cut'])
  })
})
