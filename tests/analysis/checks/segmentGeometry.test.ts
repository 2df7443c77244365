import Flatten from '@flatten-js/core'
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { closestPointsOfSegments, crossingParameters, emptyClosestPoints, stretchWithin } from '../../../server/analysis/checks/segmentGeometry'

// Reference: @flatten-js/core 1.6.15, an independent general-purpose plane geometry library
// (Segment.distanceTo, Segment.intersect, Point.distanceTo). It decides equality to within 1e-6
// (its DP_TOL), so results are compared to that and cases the tolerance makes ambiguous are left out.
const REFERENCE_TOLERANCE = 1e-6
const AMBIGUOUS_NEAR_TOUCH = 10 * REFERENCE_TOLERANCE
const coordinate = fc.double({ min: -50, max: 50, noNaN: true })
// Segments of 0.1 mm and more, as flattened cut contours have them; much shorter ones fall under the reference tolerance.
const segment = fc.tuple(coordinate, coordinate, coordinate, coordinate).filter(([ax, ay, bx, by]) => Math.hypot(bx - ax, by - ay) > 0.1)
const referenceSegment = ([ax, ay, bx, by]: number[]) => new Flatten.Segment(new Flatten.Point(ax, ay), new Flatten.Point(bx, by))

function sineBetween(first: readonly number[], second: readonly number[]): number {
  const cross = (first[2]! - first[0]!) * (second[3]! - second[1]!) - (first[3]! - first[1]!) * (second[2]! - second[0]!)
  return Math.abs(cross) / (Math.hypot(first[2]! - first[0]!, first[3]! - first[1]!) * Math.hypot(second[2]! - second[0]!, second[3]! - second[1]!))
}

/** Neither end of `ends` lies within a few reference tolerances of `other` (an end touching the other segment is a tie). */
function endsClearOf(ends: number[], other: number[]): boolean {
  const line = referenceSegment(other)
  return (
    line.distanceTo(new Flatten.Point(ends[0], ends[1]))[0] > AMBIGUOUS_NEAR_TOUCH &&
    line.distanceTo(new Flatten.Point(ends[2], ends[3]))[0] > AMBIGUOUS_NEAR_TOUCH
  )
}

describe('segment geometry against @flatten-js/core on random segments', () => {
  it('gives the same distance, and closest points that lie on the segments at that distance', () => {
    fc.assert(
      fc.property(segment, segment, (first, second) => {
        // The reference's tolerance blurs nearly parallel pairs (see the next property for those).
        fc.pre(sineBetween(first, second) > 1e-3)
        const closest = closestPointsOfSegments(...first, ...second, emptyClosestPoints())
        const [referenceDistance] = referenceSegment(first).distanceTo(referenceSegment(second))
        // Within a few tolerances the reference snaps near-touches to 0; there only closeness is comparable.
        if (referenceDistance > AMBIGUOUS_NEAR_TOUCH) expect(Math.abs(closest.distanceMm - referenceDistance)).toBeLessThanOrEqual(REFERENCE_TOLERANCE)
        else expect(closest.distanceMm).toBeLessThan(2 * AMBIGUOUS_NEAR_TOUCH)
        expect(Math.hypot(closest.qx - closest.px, closest.qy - closest.py)).toBeCloseTo(closest.distanceMm, 12)
        expect(referenceSegment(first).distanceTo(new Flatten.Point(closest.px, closest.py))[0]).toBeLessThan(REFERENCE_TOLERANCE)
        expect(referenceSegment(second).distanceTo(new Flatten.Point(closest.qx, closest.qy))[0]).toBeLessThan(REFERENCE_TOLERANCE)
      }),
      { numRuns: 2000 },
    )
  })

  it('gives the offset as the distance of parallel segments that overlap along their line (by construction)', () => {
    const anyOffsetMm = fc.double({ min: 0, max: 10, noNaN: true })
    const anyFraction = fc.double({ min: 0, max: 1, noNaN: true })
    fc.assert(
      fc.property(segment, anyOffsetMm, anyFraction, anyFraction, (first, offsetMm, from, to) => {
        const [ax, ay, bx, by] = first
        const length = Math.hypot(bx - ax, by - ay)
        const normalX = -(by - ay) / length
        const normalY = (bx - ax) / length
        const at = (t: number): [number, number] => [ax + t * (bx - ax) + offsetMm * normalX, ay + t * (by - ay) + offsetMm * normalY]
        const closest = closestPointsOfSegments(ax, ay, bx, by, ...at(from), ...at(to), emptyClosestPoints())
        expect(closest.distanceMm).toBeCloseTo(offsetMm, 9)
      }),
      { numRuns: 1000 },
    )
  })

  // A property test of 1–2 s alone, several times that on a loaded machine: the default 5 s is too tight.
  it('finds a crossing exactly when the reference does, at the same point', () => {
    fc.assert(
      fc.property(segment, segment, (first, second) => {
        const crossing = crossingParameters(...first, ...second)
        const referencePoints = referenceSegment(first).intersect(referenceSegment(second))
        // Near-parallel pairs have no single crossing (the reference lists shared ends), and pairs that pass within its tolerance are touches it may call either way.
        fc.pre(sineBetween(first, second) > 1e-3)
        fc.pre(referenceSegment(first).distanceTo(referenceSegment(second))[0] > AMBIGUOUS_NEAR_TOUCH || referencePoints.length > 0)
        fc.pre(endsClearOf(first, second) && endsClearOf(second, first))
        expect(crossing !== null).toBe(referencePoints.length > 0)
        if (crossing === null) return
        const [u] = crossing
        expect(first[0] + u * (first[2] - first[0])).toBeCloseTo(referencePoints[0]!.x, 6)
        expect(first[1] + u * (first[3] - first[1])).toBeCloseTo(referencePoints[0]!.y, 6)
      }),
      { numRuns: 2000 },
    )
  }, 60_000)

  it('crossing segments really cross: random pairs built through a common point', () => {
    const insideFraction = fc.double({ min: 0.01, max: 0.99, noNaN: true })
    fc.assert(
      fc.property(coordinate, coordinate, segment, segment, insideFraction, insideFraction, (x, y, a, b, u, v) => {
        // Shift each random segment so the point at parameter u (v) is (x, y).
        const through = ([ax, ay, bx, by]: readonly [number, number, number, number], t: number) => {
          const dx = x - (ax + t * (bx - ax))
          const dy = y - (ay + t * (by - ay))
          return [ax + dx, ay + dy, bx + dx, by + dy] as const
        }
        const first = through(a, u)
        const second = through(b, v)
        fc.pre(sineBetween([...first], [...second]) > 1e-3)
        expect(referenceSegment([...first]).intersect(referenceSegment([...second]))).toHaveLength(1)
        expect(closestPointsOfSegments(...first, ...second, emptyClosestPoints()).distanceMm).toBe(0)
      }),
      { numRuns: 1000 },
    )
  })

  it('finds the stretch of one segment within a tolerance of another as the reference distance sampled along it says', () => {
    fc.assert(
      fc.property(segment, segment, fc.double({ min: 0.01, max: 5, noNaN: true }), (first, second, toleranceMm) => {
        const stretch = stretchWithin(...first, ...second, toleranceMm)
        const reference = referenceSegment(first)
        const samples = 400
        const inside: number[] = []
        for (let sample = 0; sample <= samples; sample++) {
          const t = sample / samples
          const point = new Flatten.Point(second[0] + t * (second[2] - second[0]), second[1] + t * (second[3] - second[1]))
          if (reference.distanceTo(point)[0] <= toleranceMm) inside.push(t)
        }
        if (inside.length === 0) {
          // A stretch shorter than the sampling step may fall between samples.
          if (stretch !== null) expect(stretch[1] - stretch[0]).toBeLessThan(1 / samples)
          return
        }
        expect(stretch).not.toBeNull()
        expect(stretch![0]).toBeLessThanOrEqual(inside[0]! + 1e-9)
        expect(stretch![0]).toBeGreaterThan(inside[0]! - 1 / samples - 1e-9)
        expect(stretch![1]).toBeGreaterThanOrEqual(inside[inside.length - 1]! - 1e-9)
        expect(stretch![1]).toBeLessThan(inside[inside.length - 1]! + 1 / samples + 1e-9)
      }),
      { numRuns: 1000 },
    )
  })
})
