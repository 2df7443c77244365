import { describe, expect, it } from 'vitest'
import { analyze, CUT, cutPath, mmDocument, SCORE } from './helpers'

/**
 * Constant-acceleration kinematics (v² = v0² + 2·a·d on each ramp), written here on its own: the time to cover
 * `lengthMm` entering at v0 and leaving at v1, never above vMax, accelerating and braking at `accel`.
 */
function rampTimeS(lengthMm: number, v0: number, v1: number, vMax: number, accel: number): number {
  const peak = Math.min(vMax, Math.sqrt((2 * accel * lengthMm + v0 * v0 + v1 * v1) / 2))
  const rampsMm = (2 * peak * peak - v0 * v0 - v1 * v1) / (2 * accel)
  return (peak - v0) / accel + (peak - v1) / accel + (lengthMm - rampsMm) / peak
}

// Junction deviation (common practice in motion controllers, no formal source): at a corner whose directions differ
// by θ the head may pass at v² = a·δ·sin(θ/2)/(1 − sin(θ/2)); for a right angle θ/2 = 45°.
function rightAngleJunctionSpeed(accel: number, deviationMm: number): number {
  return Math.sqrt((accel * deviationMm * Math.SQRT1_2) / (1 - Math.SQRT1_2))
}

const accel = 2000
const deviationMm = 0.05

describe('time model', () => {
  // Raster engraving: the head sweeps the area line by line, so time = area / (line spacing × speed), speed in mm/s
  // (common practice, no source). A 50 × 20 mm fill at 24 000 mm/min (400 mm/s) and 0.1 mm lines: 1000 / 40 = 25 s.
  it('times a raster fill as area / (line spacing × speed)', () => {
    const result = analyze(mmDocument('<rect x="10" y="10" width="50" height="20" fill="#f9a825"/>'), { engraveSpeedMmPerMin: 24_000, engraveLineSpacingMm: 0.1 })
    expect(result.engrave.areaMm2).toBeCloseTo(1000, 9)
    expect(result.time.engraveS).toBeCloseTo(25, 9)
  })

  it('times score lines at the score speed and cuts at the cut speed', () => {
    const params = { cutSpeedMmPerMin: 600, scoreSpeedMmPerMin: 3000, accelMmPerS2: accel }
    const result = analyze(mmDocument(`<path d="M10 10h80" fill="none" stroke="${SCORE}"/>${cutPath('M10 30h80')}`), params)
    expect(result.time.scoreS).toBeCloseTo(rampTimeS(80, 0, 0, 3000 / 60, accel), 9)
    expect(result.time.cutS).toBeCloseTo(rampTimeS(80, 0, 0, 600 / 60, accel), 9)
  })

  // Every cut contour is pierced once: three separate holes are three pierces.
  it('pierces once per cut contour', () => {
    const holes = [10, 40, 70].map((x) => `<circle cx="${x}" cy="20" r="5" fill="none" stroke="${CUT}"/>`).join('')
    const result = analyze(mmDocument(holes), { pierceTimeS: 0.7 })
    expect(result.cut.pierces).toBe(3)
    expect(result.time.pierceS).toBeCloseTo(3 * 0.7, 9)
  })

  // A right-angle corner between two 50 mm sides: accelerate, brake to the junction speed, accelerate, stop.
  it('brakes to the junction speed before a corner', () => {
    const speed = 1200 / 60
    const corner = rightAngleJunctionSpeed(accel, deviationMm)
    const result = analyze(mmDocument(cutPath('M10 10H60V60')), { cutSpeedMmPerMin: 1200, accelMmPerS2: accel, junctionDeviationMm: deviationMm })
    expect(result.time.cutS).toBeCloseTo(rampTimeS(50, 0, corner, speed, accel) + rampTimeS(50, corner, 0, speed, accel), 9)
  })

  // After the corner only 0.02 mm remain to stop in: v² = 2·a·d limits the corner below its junction speed, so the
  // head must already brake on the first side.
  it('brakes before a corner for a stop just after it', () => {
    const speed = 1200 / 60
    const stopMm = 0.02
    const corner = Math.sqrt(2 * accel * stopMm)
    expect(corner).toBeLessThan(rightAngleJunctionSpeed(accel, deviationMm))
    const result = analyze(mmDocument(cutPath(`M10 10H60V${10 + stopMm}`)), { cutSpeedMmPerMin: 1200, accelMmPerS2: accel, junctionDeviationMm: deviationMm })
    expect(result.time.cutS).toBeCloseTo(rampTimeS(50, 0, corner, speed, accel) + rampTimeS(stopMm, corner, 0, speed, accel), 9)
  })
})
