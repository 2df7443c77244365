import { describe, expect, it } from 'vitest'
import { applyCorrection, chooseCalibrationGroup, correctionFor, type CutterTimeSample, type DatedTimeSample } from '../../../server/services/calibration/index'
import type { ComponentCoefficients } from '../../../server/services/calibration/model'
import { seededRandom } from '../../../scripts/lib/seeded-random'
import { finishedOnDay, generateJobs, HIDDEN } from './jobs'

function datedJobs(count: number, seed: number, hidden: ComponentCoefficients = HIDDEN): DatedTimeSample[] {
  return generateJobs({ count, seed, hidden, relativeNoise: 0.03 }).map((job, day) => ({ ...job, finishedAt: finishedOnDay(day) }))
}

function cutterJobs(count: number, seed: number, cutterId: number, materialFamily: string, hidden: ComponentCoefficients = HIDDEN): CutterTimeSample[] {
  return datedJobs(count, seed, hidden).map((job) => ({ ...job, cutterId, materialFamily }))
}

describe('applyCorrection', () => {
  it('scales cut, pierce and travel and adds setup unscaled (by hand: 1.1·100 + 0.9·20 + 1.2·50 + 300 = 488)', () => {
    expect(applyCorrection({ cutS: 100, pierceS: 20, travelS: 50, setupS: 300 }, { cut: 1.1, pierce: 0.9, travel: 1.2 })).toBeCloseTo(488, 12)
  })
})

describe('correctionFor', () => {
  it('gives nothing below the default of 8 usable jobs and a correction from 8 on', () => {
    const jobs = datedJobs(8, 31)
    expect(correctionFor(jobs.slice(0, 7))).toBeNull()
    expect(correctionFor(jobs)).toMatchObject({ calibratedOn: 8 })
    const oneUnusable = jobs.map((job, index) => (index === 0 ? { ...job, actualS: Number.NaN } : job))
    expect(correctionFor(oneUnusable)).toBeNull()
    expect(correctionFor(jobs.slice(0, 5), { minSamples: 5 })).toMatchObject({ calibratedOn: 5 })
  })

  it('holds out the newest quarter by finish time, whatever order the jobs come in', () => {
    const jobs = datedJobs(40, 32)
    const random = seededRandom(33)
    const shuffled = jobs.map((job) => ({ job, key: random() })).sort((a, b) => a.key - b.key).map(({ job }) => job)
    const inOrder = correctionFor(jobs)!
    expect(inOrder.holdOut).toMatchObject({ trainedOn: 30, heldOut: 10 })
    expect(correctionFor(shuffled)).toEqual(inOrder)
  })

  it('reports a smaller error after calibration than before on jobs with a hidden correction', () => {
    const correction = correctionFor(datedJobs(60, 34))!
    expect(correction.model).toBe('components')
    expect(correction.holdOut!.corrected.medianPercent).toBeLessThan(correction.holdOut!.uncorrected.medianPercent)
  })
})

describe('chooseCalibrationGroup', () => {
  const acrylicHidden = { cut: 1.3, pierce: 1.1, travel: 1.0 }
  const plywood = cutterJobs(20, 41, 1, 'plywood')
  const acrylic = cutterJobs(12, 42, 1, 'acrylic', acrylicHidden)
  const otherCutter = cutterJobs(30, 43, 2, 'plywood')
  const all = [...plywood, ...acrylic, ...otherCutter]

  it('takes the cutter and family when that group alone has enough jobs', () => {
    const group = chooseCalibrationGroup(all, { cutterId: 1, materialFamily: 'acrylic' })
    expect(group.scope).toBe('cutter-and-family')
    expect(group.samples).toEqual(acrylic)
  })

  it('falls back to all of the cutter’s jobs, never another cutter’s, when the family has too few', () => {
    const group = chooseCalibrationGroup(all, { cutterId: 1, materialFamily: 'acrylic' }, 13)
    expect(group.scope).toBe('cutter')
    expect(group.samples).toEqual([...plywood, ...acrylic])
    expect(chooseCalibrationGroup(all, { cutterId: 2, materialFamily: 'steel' })).toEqual({ scope: 'cutter', samples: otherCutter })
  })

  it('does not count unusable jobs toward the family threshold', () => {
    const withBroken = acrylic.map((job, index) => (index < 5 ? { ...job, actualS: 0 } : job))
    expect(chooseCalibrationGroup([...plywood, ...withBroken], { cutterId: 1, materialFamily: 'acrylic' }).scope).toBe('cutter')
  })
})
