import { describe, expect, it } from 'vitest'
import { circlePath, findingsOf, rectanglePath, SHEET_OUTLINE } from './helpers'

// Hand-worked geometry: cuts whose centre lines cross or meet, or come within one kerf of each other
// across the piece that drops out, run into each other once cut.
describe('merged-cuts', () => {
  it('reports two overlapping rectangles once, naming both', () => {
    const findings = findingsOf('merged-cuts', [rectanglePath(0, 0, 100, 100), rectanglePath(50, 50, 100, 100)])
    expect(findings).toHaveLength(1)
    expect(findings[0]).toMatchObject({ severity: 'error', cause: 'touch', contours: [0, 1] })
  })

  it('reports a slit that runs into a hole', () => {
    expect(findingsOf('merged-cuts', [SHEET_OUTLINE, 'M10 50H46', circlePath(50, 50, 5)])).toHaveLength(1)
  })

  it('reports two parts drawn 0.1 mm apart with a 0.2 mm kerf: web 0.1 − 0.2 = −0.1 mm', () => {
    const [finding, ...rest] = findingsOf('merged-cuts', [rectanglePath(0, 0, 20, 20), rectanglePath(20.1, 0, 20, 20)])
    expect(rest).toEqual([])
    expect(finding).toMatchObject({ cause: 'within-kerf', limitMm: 0 })
    expect(finding!.valueMm).toBeCloseTo(-0.1, 6)
  })

  it('leaves parts 0.5 mm apart alone (the gap between parts is not a bridge), and does not also report a burnt-away bridge', () => {
    expect(findingsOf('merged-cuts', [rectanglePath(0, 0, 20, 20), rectanglePath(20.5, 0, 20, 20)])).toEqual([])
    expect(findingsOf('narrow-bridge', [rectanglePath(0, 0, 20, 20), rectanglePath(20.5, 0, 20, 20)])).toEqual([])
    expect(findingsOf('merged-cuts', ['M10 10H60', 'M10 10.15H60'])).toEqual([])
  })
})
