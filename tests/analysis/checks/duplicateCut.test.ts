import { describe, expect, it } from 'vitest'
import { sitesOf } from '../sites'
import { analyse, findingsOf, rectanglePath } from './helpers'

// Hand-worked: a line drawn twice is cut twice; the extra time is its length at cut speed (length ÷ speed).
const cutSpeed = { kerfMm: 0.2, cutSpeedMmPerMin: 600 }

describe('duplicate-cut', () => {
  it('reports a 100 mm square drawn twice: 400 mm cut again, 40 s at 600 mm/min', () => {
    const { result } = analyse([rectanglePath(0, 0, 100, 100), rectanglePath(0, 0, 100, 100)], cutSpeed)
    const duplicates = sitesOf(result, 'duplicate-cut')
    expect(duplicates).toHaveLength(1)
    expect(duplicates[0]!.facts.lengthMm).toBeCloseTo(400, 6)
    expect(duplicates[0]!.facts.seconds).toBeCloseTo(40, 6)
    expect(duplicates[0]!.valueMm).toBeCloseTo(400, 6)
    expect(duplicates[0]!.contours).toEqual([0, 1])
    expect(result.checks.duplicateCutLengthMm).toBeCloseTo(400, 6)
    expect(result.checks.duplicateCutTimeS).toBeCloseTo(40, 6)
    // The copies touch everywhere; that is the repeat, not two cuts running into each other.
    expect([...sitesOf(result, 'merged-cuts'), ...sitesOf(result, 'narrow-bridge')]).toEqual([])
  })

  it('counts a line drawn three times as two extra passes', () => {
    const [finding] = findingsOf('duplicate-cut', ['M0 0H50', 'M0 0H50', 'M50 0H0'], cutSpeed)
    expect(finding!.valueMm).toBeCloseTo(100, 6)
  })

  it('finds the shared side of two rectangles drawn edge to edge (30 mm), and a line that goes back over itself', () => {
    expect(findingsOf('duplicate-cut', [rectanglePath(0, 0, 20, 30), rectanglePath(20, 0, 20, 30)], cutSpeed).map((finding) => finding.valueMm)).toEqual([expect.closeTo(30, 6)])
    expect(findingsOf('duplicate-cut', ['M0 0H50H10'], cutSpeed).map((finding) => finding.valueMm)).toEqual([expect.closeTo(40, 6)])
  })

  it('finds a copy shifted by less than the tolerance (0.01 mm) but not lines 0.5 mm apart or a plain polygon', () => {
    expect(findingsOf('duplicate-cut', ['M0 0H50', 'M0 0.01H50'], cutSpeed)).toHaveLength(1)
    expect(findingsOf('duplicate-cut', ['M0 0H50', 'M0 0.5H50'], cutSpeed)).toEqual([])
    expect(findingsOf('duplicate-cut', [rectanglePath(0, 0, 20, 30), 'M40 40a10 10 0 1 0 20 0a10 10 0 1 0 -20 0'], cutSpeed)).toEqual([])
  })
})
