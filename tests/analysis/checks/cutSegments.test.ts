import { describe, expect, it } from 'vitest'
import { cutSegmentsOf } from '../../../server/analysis/checks/cutSegments'
import { nearCutsOf } from '../../../server/analysis/checks/nearCuts'
import { withDefaults } from '../../../server/analysis/index'
import { analyse, findingsOf, HAND_PARAMS, rectanglePath } from './helpers'

describe('cut segment neighbours', () => {
  it('links the segments of an open cut in a row and wraps a closed one round', () => {
    // Contour 0: an open cut of three segments; contour 1: a closed square of four.
    const { geometry } = analyse(['M0 0H10V10H20', rectanglePath(50, 50, 10, 10)])
    const segments = cutSegmentsOf(geometry, withDefaults(HAND_PARAMS))
    expect(Array.from(segments.contourOf)).toEqual([0, 0, 0, 1, 1, 1, 1])
    expect(Array.from(segments.previousOf)).toEqual([-1, 0, 1, 6, 3, 4, 5])
    expect(Array.from(segments.nextOf)).toEqual([1, 2, -1, 4, 5, 6, 3])
    expect(segments.adjacent(3, 6)).toBe(true)
    expect(segments.adjacent(0, 2)).toBe(false)
  })

  it('gives each segment of a closed cut there and back the other as both neighbours', () => {
    const { geometry } = analyse(['M0 0H10Z'])
    const segments = cutSegmentsOf(geometry, withDefaults(HAND_PARAMS))
    expect(Array.from(segments.previousOf)).toEqual([1, 0])
    expect(Array.from(segments.nextOf)).toEqual([1, 0])
  })
})

describe('near cut list filter', () => {
  it('returns the list itself when every pair is kept, and a copy of the kept pairs in order otherwise', () => {
    const { geometry } = analyse(['M0 0H10', 'M0 0.5H10', 'M0 1H10'])
    const nearCuts = nearCutsOf(geometry, withDefaults(HAND_PARAMS))
    expect(nearCuts.count).toBe(3)
    expect(nearCuts.filter(() => true)).toBe(nearCuts)
    const kept = nearCuts.filter((slot) => slot !== 1)
    expect(kept.count).toBe(2)
    expect([Array.from(kept.first.subarray(0, 2)), Array.from(kept.second.subarray(0, 2))]).toEqual([
      [nearCuts.first[0], nearCuts.first[2]],
      [nearCuts.second[0], nearCuts.second[2]],
    ])
    expect(Array.from(kept.distanceMm.subarray(0, 2))).toEqual([nearCuts.distanceMm[0], nearCuts.distanceMm[2]])
    expect(kept.closest(1).distanceMm).toBe(nearCuts.closest(2).distanceMm)
  })
})

describe('near cuts of long diagonal cuts', () => {
  it('finds the narrow bridges between five long diagonal slits 0.5 mm apart (too long for the grid of chunk boxes)', () => {
    const offsetMm = 0.5 * Math.SQRT2
    const slits = Array.from({ length: 5 }, (_, index) => `M${10 + index * offsetMm} 10L${110 + index * offsetMm} 110`)
    const bridges = findingsOf('narrow-bridge', slits)
    expect(bridges).toHaveLength(4)
    for (const bridge of bridges) expect(bridge.valueMm).toBeCloseTo(0.3, 6)
    expect(bridges.map((bridge) => bridge.contours!.join('-')).sort()).toEqual(['0-1', '1-2', '2-3', '3-4'])
  })
})
