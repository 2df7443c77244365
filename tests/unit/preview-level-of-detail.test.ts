import Flatten from '@flatten-js/core'
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { decodeGeometry, encodeGeometry, type PreviewGeometry } from '../../shared/packed-analysis'
import { buildContourIndex, contoursInView, dotGrid, traceContours, type PixelTransform, type TraceTarget } from '../../utils/preview/contour-index'

// Reference: @flatten-js/core 1.6.15 (an independent plane geometry library): contour boxes as the merge of
// its Segment boxes, view culling by its Box.intersect, and the distance of every original point to the
// traced polyline by its Segment.distanceTo.
type Contour = { points: [number, number][]; operation?: number; closed?: boolean }

function geometryOf(contours: Contour[]): PreviewGeometry {
  const start = new Uint32Array(contours.length + 1)
  const xy: number[] = []
  contours.forEach((c, i) => {
    start[i] = xy.length / 2
    for (const [x, y] of c.points) xy.push(x, y)
  })
  start[contours.length] = xy.length / 2
  const operation = Uint8Array.from(contours.map((c) => c.operation ?? 0))
  const closed = Uint8Array.from(contours.map((c) => (c.closed ? 1 : 0)))
  return decodeGeometry(encodeGeometry({ count: contours.length, start, operation, closed, xy: Float64Array.from(xy) }))
}

function referenceBox(points: [number, number][]): Flatten.Box {
  if (points.length === 1) return new Flatten.Point(...points[0]!).box
  let box = new Flatten.Box()
  for (let i = 1; i < points.length; i++) box = box.merge(new Flatten.Segment(new Flatten.Point(...points[i - 1]!), new Flatten.Point(...points[i]!)).box)
  return box
}

/** Records what a trace writes: polylines (in device pixels) and dots. */
function recorder(width = 1000, height = 1000) {
  const lines: [number, number][][] = []
  const dots: [number, number][] = []
  const target: TraceTarget = {
    lines: {
      moveTo: (x, y) => lines.push([[x, y]]),
      lineTo: (x, y) => lines.at(-1)!.push([x, y]),
    },
    dots: { rect: (x, y) => dots.push([x, y]) },
    grid: dotGrid(width, height),
  }
  return { lines, dots, target }
}

const f32 = (v: number) => Math.fround(v)
const point = fc
  .tuple(fc.double({ min: 0, max: 500, noNaN: true }), fc.double({ min: 0, max: 500, noNaN: true }))
  .map(([x, y]) => [f32(x), f32(y)] as [number, number])
const contour = fc.array(point, { minLength: 2, maxLength: 8 })

describe('preview culling', () => {
  it('finds exactly the contours whose boxes meet the view', () => {
    fc.assert(
      fc.property(fc.array(contour, { minLength: 1, maxLength: 60 }), point, point, (shapes, a, b) => {
        const geometry = geometryOf(shapes.map((points) => ({ points })))
        const index = buildContourIndex(geometry)
        const view = [Math.min(a[0], b[0]), Math.min(a[1], b[1]), Math.max(a[0], b[0]), Math.max(a[1], b[1])] as const
        const viewBox = new Flatten.Box(...view)
        const expected = shapes.map((points, i) => (referenceBox(points).intersect(viewBox) ? i : -1)).filter((i) => i >= 0)
        const found = contoursInView(index, view)
        expect(found === null ? shapes.map((_, i) => i) : Array.from(found).sort((x, y) => x - y)).toEqual(expected)
      }),
    )
  })

  it('answers "all" when the whole drawing is in view, so a fitted frame skips the search', () => {
    const geometry = geometryOf([{ points: [[0, 0], [10, 5]] }, { points: [[20, 20], [30, 40]] }])
    expect(contoursInView(buildContourIndex(geometry), [-1, -1, 31, 41])).toBeNull()
  })
})

describe('preview level of detail', () => {
  const transform = (scale: number): PixelTransform => ({ originX: 0, originY: 0, scale })

  it('draws a contour under a pixel as one dot, and many in one pixel as one dot', () => {
    const tiny: Contour[] = Array.from({ length: 50 }, (_, i) => ({ points: [[10 + i * 0.001, 10], [10.005 + i * 0.001, 10.004]] as [number, number][] }))
    const geometry = geometryOf([...tiny, { points: [[0, 0], [100, 0]] }])
    const { lines, dots, target } = recorder()
    const counts = traceContours(geometry, buildContourIndex(geometry), null, 0, transform(2), target)
    // 50 contours of at most 0.06 mm at 2 px/mm all fall in pixel (20, 20).
    expect(dots).toEqual([[20, 20]])
    expect(counts.dots).toBe(50)
    expect(lines).toHaveLength(1)
  })

  // A property test of 1–2 s alone, several times that on a loaded machine: the default 5 s is too tight.
  it('skips points closer than a pixel but stays within a pixel of every original point', () => {
    fc.assert(
      fc.property(fc.array(point, { minLength: 2, maxLength: 200 }), fc.double({ min: 0.05, max: 20, noNaN: true }), fc.boolean(), (points, scale, closed) => {
        const shape = closed ? [...points, points[0]!] : points
        const geometry = geometryOf([{ points: shape, closed }])
        const { lines, dots, target } = recorder(20_000, 20_000)
        traceContours(geometry, buildContourIndex(geometry), null, 0, transform(scale), target)
        const box = referenceBox(shape)
        if (Math.max(box.xmax - box.xmin, box.ymax - box.ymin) * scale < 1) {
          expect(dots.length + lines.length).toBeLessThanOrEqual(1)
          return
        }
        expect(lines).toHaveLength(1)
        const traced = lines[0]!
        // Ends are kept; consecutive traced points are at least a pixel apart except the last step.
        expect(traced[0]).toEqual([shape[0]![0] * scale, shape[0]![1] * scale])
        const lastOriginal = shape.at(-1)!
        expect(traced.at(-1)![0]).toBeCloseTo(lastOriginal[0] * scale, 6)
        expect(traced.at(-1)![1]).toBeCloseTo(lastOriginal[1] * scale, 6)
        for (let i = 1; i < traced.length - 1; i++)
          expect(Math.hypot(traced[i]![0] - traced[i - 1]![0], traced[i]![1] - traced[i - 1]![1])).toBeGreaterThanOrEqual(1 - 1e-9)
        const segments = traced.slice(1).map((p, i) => new Flatten.Segment(new Flatten.Point(...traced[i]!), new Flatten.Point(...p)))
        for (const [x, y] of shape) {
          const p = new Flatten.Point(x * scale, y * scale)
          const distance = segments.length ? Math.min(...segments.map((s) => s.distanceTo(p)[0])) : 0
          expect(distance).toBeLessThan(1 + 1e-6)
        }
      }),
    )
  }, 60_000)

  it('traces every point when they are far apart, and only the asked operation', () => {
    const geometry = geometryOf([
      { points: [[0, 0], [10, 0], [10, 10], [0, 10], [0, 0]], closed: true },
      { points: [[50, 50], [60, 60]], operation: 1 },
    ])
    const index = buildContourIndex(geometry)
    const cut = recorder()
    traceContours(geometry, index, null, 0, transform(3), cut.target)
    expect(cut.lines).toEqual([[[0, 0], [30, 0], [30, 30], [0, 30], [0, 0]]])
    const score = recorder()
    traceContours(geometry, index, [0, 1], 1, transform(3), score.target)
    expect(score.lines).toEqual([[[150, 150], [180, 180]]])
  })
})
