import { describe, expect, it } from 'vitest'
import { findingsOf, rectanglePath } from './helpers'

describe('open-contour', () => {
  it('notes an open slit and warns when the ends of an outline are 0.1 mm apart (< 0.2 mm)', () => {
    expect(findingsOf('open-contour', ['M0 0H20'])).toMatchObject([{ severity: 'info', cause: 'slit', contours: [0] }])
    const [nearlyClosed] = findingsOf('open-contour', ['M0 0H20V20H0V0.1'])
    expect(nearlyClosed).toMatchObject({ severity: 'warning', cause: 'nearly-closed', limitMm: 0.2 })
    expect(nearlyClosed!.valueMm).toBeCloseTo(0.1, 6)
  })

  it('says nothing about closed outlines', () => {
    expect(findingsOf('open-contour', [rectanglePath(0, 0, 20, 20)])).toEqual([])
  })
})

describe('tiny-segment', () => {
  it('flags a stray 0.1 mm line (shorter than twice the 0.2 mm kerf), not a 1 mm one', () => {
    expect(findingsOf('tiny-segment', ['M50 50h0.1', 'M0 0h1'])).toMatchObject([{ severity: 'warning', contours: [0] }])
  })
})

describe('self-intersection', () => {
  it('flags a bow tie that crosses itself at (10, 10), not a square or a star-free polygon', () => {
    const [finding, ...rest] = findingsOf('self-intersection', ['M0 0L20 20H0L20 0Z'])
    expect(rest).toEqual([])
    expect(finding!.x).toBeCloseTo(10, 6)
    expect(finding!.y).toBeCloseTo(10, 6)
    expect(findingsOf('self-intersection', [rectanglePath(0, 0, 20, 20), 'M40 0L60 0L70 10L50 20Z'])).toEqual([])
  })
})
