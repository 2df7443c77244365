import { describe, expect, it } from 'vitest'
import { analyse, circlePath, rectanglePath, SHEET_OUTLINE } from './helpers'

describe('checks in the engine result', () => {
  it('lists errors first, then warnings, then notes, and adds the summary', () => {
    const { result } = analyse([SHEET_OUTLINE, 'M10 10H60', 'M10 11H60', 'M10 30H60', 'M10 30.1H60', rectanglePath(100, 100, 20, 20), rectanglePath(110, 110, 20, 20), circlePath(150, 50, 0.5)])
    const severities = result.findings.map((finding) => finding.severity)
    expect(severities).toEqual([...severities].sort((a, b) => ['error', 'warning', 'info'].indexOf(a) - ['error', 'warning', 'info'].indexOf(b)))
    expect(new Set(result.findings.map((finding) => finding.code))).toEqual(new Set(['narrow-bridge', 'merged-cuts', 'small-hole', 'open-contour']))
    expect(result.checks).toMatchObject({ narrowBridgeSites: 2, duplicateCutLengthMm: 0, duplicateCutTimeS: 0 })
    expect(result.checks?.narrowestBridgeMm).toBeCloseTo(0.1 - 0.2, 9)
  })
})
