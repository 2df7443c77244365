import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { analyze, cutPath, mmDocument } from './helpers'

// A small pattern of my own: an outline, a hole, two slits drawn as separate lines that chain, and a curved slot.
const pattern = [
  cutPath('M0 0H80V60H0Z'),
  cutPath('M20 20A6 6 0 1 1 20.001 20Z'),
  cutPath('M40 10L60 10'),
  cutPath('M60 10L60 30'),
  cutPath('M10 50C20 40 40 60 50 50'),
].join('')

const reference = analyze(mmDocument(pattern))

describe('invariants (property tests)', () => {
  // Euclidean isometries preserve length (SVG 1.1 transform matrices: translate and rotate are isometries).
  it('keeps length and pierces under translation, rotation and extra groups', () => {
    const anyShift = fc.double({ min: -200, max: 200, noNaN: true })
    const anyAngleDeg = fc.double({ min: -360, max: 360, noNaN: true })
    const anyGroupCount = fc.integer({ min: 0, max: 20 })
    fc.assert(
      fc.property(anyShift, anyShift, anyAngleDeg, anyGroupCount, (dx, dy, angle, extraGroups) => {
        const wrapped = `${'<g>'.repeat(extraGroups)}<g transform="translate(${dx} ${dy}) rotate(${angle} 40 30)">${pattern}</g>${'</g>'.repeat(extraGroups)}`
        const moved = analyze(mmDocument(wrapped))
        expect(moved.cut.lengthMm).toBeCloseTo(reference.cut.lengthMm, 6)
        expect(moved.cut.pierces).toBe(reference.cut.pierces)
      }),
      { numRuns: 50 },
    )
  })

  // Uniform scale by k multiplies every length by k (similarity).
  it('scales length by k', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.05, max: 20, noNaN: true }), (k) => {
        const scaled = analyze(mmDocument(`<g transform="scale(${k})">${pattern}</g>`))
        expect(scaled.cut.lengthMm / (k * reference.cut.lengthMm)).toBeCloseTo(1, 6)
        expect(scaled.cut.pierces).toBe(reference.cut.pierces)
      }),
      { numRuns: 40 },
    )
  })
})
