import { describe, expect, it } from 'vitest'
import { DEFAULT_ANALYSIS_PARAMS, withDefaults } from '../../../server/analysis/index'
import { findingsOf, rectanglePath } from './helpers'

describe('outside-sheet', () => {
  // Default profile: 600 × 400 mm sheet, 1000 × 700 mm bed, 5 mm margin.
  it('warns when the drawing fits the bed but not the sheet either way round (800 × 100 mm)', () => {
    const [finding, ...rest] = findingsOf('outside-sheet', [rectanglePath(0, 0, 800, 100)])
    expect(rest).toEqual([])
    expect(finding).toMatchObject({ severity: 'warning', cause: 'beyond-sheet', valueMm: 800, limitMm: 590, contours: [] })
    expect(finding!.facts).toMatchObject({ drawingWidthMm: 800, drawingHeightMm: 100, usableWidthMm: 590, usableHeightMm: 390, marginMm: 5, linesOutside: 1 })
  })

  it('is an error beyond the bed (1200 × 100 mm) and counts and boxes only the lines that stick out', () => {
    const [finding] = findingsOf('outside-sheet', [rectanglePath(0, 0, 10, 10), 'M0 50H1200'])
    expect(finding).toMatchObject({ severity: 'error', cause: 'beyond-bed', limitMm: 990, contours: [] })
    expect(finding!.facts).toMatchObject({ linesOutside: 1, outsideMinXMm: 0, outsideMinYMm: 50, outsideMaxXMm: 1200, outsideMaxYMm: 50 })
  })

  it('accepts a drawing that fits as drawn or turned (300 × 550 mm)', () => {
    expect(findingsOf('outside-sheet', [rectanglePath(0, 0, 500, 300)])).toEqual([])
    expect(findingsOf('outside-sheet', [rectanglePath(0, 0, 300, 550)])).toEqual([])
  })
})

describe('material-not-allowed and too-thick', () => {
  const reason = 'This plastic gives off a corrosive gas when heated.'
  it('reports a material the cutter kind may not cut, with the reason', () => {
    const [finding] = findingsOf('material-not-allowed', ['M0 0H10'], { materialAllowed: { allowed: false, reason } })
    expect(finding!.severity).toBe('error')
    expect(finding!.facts.reason).toBe(reason)
    expect(findingsOf('material-not-allowed', ['M0 0H10'], { materialAllowed: { allowed: true, reason: '' } })).toEqual([])
    expect(findingsOf('material-not-allowed', ['M0 0H10'], {})).toEqual([])
  })

  it('reports a thickness above the cutter limit', () => {
    expect(findingsOf('too-thick', ['M0 0H10'], { thicknessMm: 12, cutterMaxThicknessMm: 10 })).toMatchObject([{ severity: 'error', valueMm: 12, limitMm: 10 }])
    expect(findingsOf('too-thick', ['M0 0H10'], { thicknessMm: 10, cutterMaxThicknessMm: 10 })).toEqual([])
  })
})

describe('limits from the thickness', () => {
  // Common practice, no source: minimum bridge about half the thickness, minimum hole about the thickness.
  it('derives minimum bridge and hole from a given thickness unless they are given', () => {
    expect(withDefaults({ thicknessMm: 6 })).toMatchObject({ minBridgeMm: 3, minHoleMm: 6 })
    expect(withDefaults({ thicknessMm: 6, minHoleMm: 4 })).toMatchObject({ minBridgeMm: 3, minHoleMm: 4 })
    expect(DEFAULT_ANALYSIS_PARAMS).toMatchObject({ thicknessMm: 3, minBridgeMm: 1.5, minHoleMm: 3 })
  })
})
