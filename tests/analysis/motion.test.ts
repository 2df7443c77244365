import { describe, expect, it } from 'vitest'
import { junctionSpeed, restToRestTimeS } from '../../server/analysis/motion'
import { analyze, CUT, cutPath, mmDocument } from './helpers'

const speedMmPerMin = 1200
const v = speedMmPerMin / 60

describe('motion model', () => {
  // Constant-acceleration kinematics: rest to rest over L takes L/v + v/a when L ≥ v²/a (trapezoid), else 2√(L/a) (triangle).
  it.each([
    [100, 500],
    [0.5, 500],
    [0.8, 500],
    [300, 50],
  ])('a straight slit of %f mm at accel %f takes the closed-form time', (lengthMm, accel) => {
    const expected = lengthMm >= (v * v) / accel ? lengthMm / v + v / accel : 2 * Math.sqrt(lengthMm / accel)
    const result = analyze(mmDocument(cutPath(`M10 10h${lengthMm}`)), { cutSpeedMmPerMin: speedMmPerMin, accelMmPerS2: accel })
    expect(result.time.cutS).toBeCloseTo(expected, 9)
  })

  it('treats accel 0 as no limit: time = length / speed', () => {
    const result = analyze(mmDocument(cutPath('M0 0H100V50')), { cutSpeedMmPerMin: speedMmPerMin, accelMmPerS2: 0 })
    expect(result.time.cutS).toBeCloseTo(150 / v, 9)
  })

  // A full reversal must stop the head: the slit out and back is two rest-to-rest moves.
  it('stops at a reversal', () => {
    const accel = 500
    const result = analyze(mmDocument(cutPath('M0 0H50H0')), { cutSpeedMmPerMin: speedMmPerMin, accelMmPerS2: accel })
    expect(result.time.cutS).toBeCloseTo(2 * restToRestTimeS(50, v, accel), 9)
  })

  // Junction deviation (common practice, no source): v² = a·δ·sin(θ/2) / (1 − sin(θ/2)), θ between the reversed incoming and the outgoing direction; 90° gives sin(θ/2) = √½.
  it('limits a right-angle corner to the junction-deviation speed', () => {
    const expected = Math.sqrt((1000 * 0.05 * Math.SQRT1_2) / (1 - Math.SQRT1_2))
    expect(junctionSpeed(1, 0, 0, 1, 1000, 1000, 0.05)).toBeCloseTo(expected, 9)
    expect(junctionSpeed(1, 0, 1, 0, 20, 1000, 0.05)).toBe(20)
    expect(junctionSpeed(1, 0, -1, 0, 20, 1000, 0.05)).toBe(0)
  })

  it('runs a square faster than four separate stops but slower than no corners', () => {
    const accel = 500
    const square = analyze(mmDocument(cutPath('M0 0H40V40H0Z')), { cutSpeedMmPerMin: speedMmPerMin, accelMmPerS2: accel, junctionDeviationMm: 0.05 })
    expect(square.time.cutS).toBeLessThan(4 * restToRestTimeS(40, v, accel))
    expect(square.time.cutS).toBeGreaterThan(restToRestTimeS(160, v, accel))
  })

  // Travel is a rapid rest-to-rest move; from the origin to a slit at (30, 40) is 50 mm (3-4-5 triangle).
  it('adds the rapid travel from the origin and pierce time per contour', () => {
    const result = analyze(mmDocument(cutPath('M30 40h10')), { rapidSpeedMmPerMin: 6000, accelMmPerS2: 1000, pierceTimeS: 0.7, setupTimeS: 5 })
    expect(result.travelMm).toBeCloseTo(50, 9)
    expect(result.time.travelS).toBeCloseTo(restToRestTimeS(50, 100, 1000), 9)
    expect(result.time.pierceS).toBeCloseTo(0.7, 9)
    expect(result.time.totalS).toBeCloseTo(result.time.cutS + result.time.travelS + 0.7 + 5, 9)
  })

  // Uniform circular motion: centripetal acceleration a = v²/r, so on a circle of radius r the head may not exceed
  // v = √(a·r). A 0.5 mm hole at 100 mm/s with a = 2000 mm/s² allows only √1000 ≈ 31.6 mm/s: the time is the
  // trapezoid at that speed (L/v + v/a, from rest back to rest).
  it('slows a small hole to √(a·r), from a = v²/r', () => {
    const accel = 2000
    const radius = 0.5
    const limit = Math.sqrt(accel * radius)
    const result = analyze(mmDocument(`<circle cx="50" cy="50" r="${radius}" fill="none" stroke="${CUT}"/>`), { cutSpeedMmPerMin: 6000, accelMmPerS2: accel, junctionDeviationMm: 0.05 })
    const lengthMm = 2 * Math.PI * radius
    expect(result.time.cutS / (lengthMm / limit + limit / accel)).toBeCloseTo(1, 2)
  })

  // The same rule leaves a large circle alone: at 20 mm/s, √(a·r) = √(2000 · 100) ≈ 447 mm/s is no limit.
  it('runs a large circle at full speed', () => {
    const accel = 2000
    const result = analyze(mmDocument(`<circle cx="150" cy="150" r="100" fill="none" stroke="${CUT}"/>`), { cutSpeedMmPerMin: speedMmPerMin, accelMmPerS2: accel, junctionDeviationMm: 0.05 })
    expect(result.time.cutS / ((2 * Math.PI * 100) / v + v / accel)).toBeCloseTo(1, 3)
  })
})
