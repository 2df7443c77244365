import Flatten from '@flatten-js/core'
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { fitBox, focusPoint, MAX_SCALE, panBy, resizeKeepingCentre, toDrawing, toScreen, visibleBox, zoomAt, type Viewport } from '../../utils/preview/viewport'

// Reference: @flatten-js/core 1.6.15 (an independent plane geometry library): the view as its affine Matrix
// (scale, then translate), boxes as its Box, containment and intersection by its own tests.
const referenceMatrix = (view: Viewport) => new Flatten.Matrix(view.scale, 0, 0, view.scale, -view.originX * view.scale, -view.originY * view.scale)
const onScreen = (view: Viewport, x: number, y: number) => referenceMatrix(view).transform([x, y])

const coordinate = fc.double({ min: -2000, max: 2000, noNaN: true })
// From 6 mm, so that no fit reaches the closest zoom on a 2000 px screen.
const span = fc.double({ min: 6, max: 3000, noNaN: true })
const screenSize = fc.record({ width: fc.integer({ min: 200, max: 2000 }), height: fc.integer({ min: 150, max: 1400 }) })
const drawingBox = fc.tuple(coordinate, coordinate, span, span).map(([x, y, w, h]) => [x, y, x + w, y + h] as const)

describe('preview viewport', () => {
  it('fits a drawing box inside the screen, centred, filling one direction up to the padding', () => {
    fc.assert(
      fc.property(drawingBox, screenSize, (box, screen) => {
        const view = fitBox(box, screen)
        const [x0, y0] = onScreen(view, box[0], box[1])
        const [x1, y1] = onScreen(view, box[2], box[3])
        const fitted = new Flatten.Box(x0, y0, x1, y1)
        const pad = Math.min(screen.width, screen.height) * 0.04
        const inner = new Flatten.Box(pad - 1e-6, pad - 1e-6, screen.width - pad + 1e-6, screen.height - pad + 1e-6)
        expect(
          inner.intersect(fitted) && fitted.xmin >= inner.xmin && fitted.ymin >= inner.ymin && fitted.xmax <= inner.xmax && fitted.ymax <= inner.ymax,
        ).toBe(true)
        // Centred, and one side reaches the padding: never a dot in a large field.
        expect((x0 + x1) / 2).toBeCloseTo(screen.width / 2, 6)
        expect((y0 + y1) / 2).toBeCloseTo(screen.height / 2, 6)
        const slackX = screen.width - 2 * pad - (x1 - x0)
        const slackY = screen.height - 2 * pad - (y1 - y0)
        expect(Math.min(slackX, slackY)).toBeLessThan(1e-6 * Math.max(screen.width, screen.height) + 1e-6)
      }),
    )
  })

  it('keeps the drawing point under the pointer where it is when zooming', () => {
    const anyFactor = fc.double({ min: 0.1, max: 10, noNaN: true })
    const anyFraction = fc.double({ min: 0, max: 1, noNaN: true })
    fc.assert(
      fc.property(drawingBox, screenSize, anyFactor, anyFraction, anyFraction, (box, screen, factor, fx, fy) => {
        const before = fitBox(box, screen)
        const sx = fx * screen.width
        const sy = fy * screen.height
        const after = zoomAt(before, factor, sx, sy)
        const [x, y] = toDrawing(before, sx, sy)
        const [ax, ay] = onScreen(after, x, y)
        expect(ax).toBeCloseTo(sx, 4)
        expect(ay).toBeCloseTo(sy, 4)
        expect(after.scale).toBeCloseTo(Math.min(before.scale * factor, MAX_SCALE), 9)
      }),
    )
  })

  it('agrees with the reference matrix both ways, and moves the drawing with a drag', () => {
    const anyShiftPx = fc.integer({ min: -500, max: 500 })
    fc.assert(
      fc.property(drawingBox, screenSize, coordinate, coordinate, anyShiftPx, anyShiftPx, (box, screen, x, y, dx, dy) => {
        const view = fitBox(box, screen)
        const [sx, sy] = toScreen(view, x, y)
        const [rx, ry] = onScreen(view, x, y)
        expect(sx).toBeCloseTo(rx, 6)
        expect(sy).toBeCloseTo(ry, 6)
        const [bx, by] = toDrawing(view, sx, sy)
        expect(bx).toBeCloseTo(x, 6)
        expect(by).toBeCloseTo(y, 6)
        const [px, py] = onScreen(panBy(view, dx, dy), x, y)
        expect(px).toBeCloseTo(sx + dx, 6)
        expect(py).toBeCloseTo(sy + dy, 6)
      }),
    )
  })

  it('sees exactly the screen: the visible box maps onto the screen rectangle', () => {
    fc.assert(
      fc.property(drawingBox, screenSize, (box, screen) => {
        const view = fitBox(box, screen)
        const [x0, y0, x1, y1] = visibleBox(view, screen)
        const [a, b] = onScreen(view, x0, y0)
        const [c, d] = onScreen(view, x1, y1)
        expect([a, b, c, d].map((v) => Math.round(v * 1e6) / 1e6)).toEqual([0, 0, screen.width, screen.height])
      }),
    )
  })

  it('centres a site and zooms in to it, but never out of a closer view', () => {
    const screen = { width: 800, height: 500 }
    const wide = fitBox([0, 0, 1000, 1000], screen)
    const focused = focusPoint(wide, screen, 123.4, 567.8, 12)
    const [cx, cy] = onScreen(focused, 123.4, 567.8)
    expect(cx).toBeCloseTo(400, 6)
    expect(cy).toBeCloseTo(250, 6)
    // 12 mm across the smaller side.
    expect(focused.scale).toBeCloseTo(500 / 12, 9)
    const closer = { ...focused, scale: focused.scale * 3 }
    expect(focusPoint(closer, screen, 10, 10, 12).scale).toBe(closer.scale)
  })

  it('keeps the centre in place when the screen changes size', () => {
    const view = fitBox([0, 0, 300, 200], { width: 600, height: 400 })
    const resized = resizeKeepingCentre(view, { width: 600, height: 400 }, { width: 900, height: 300 })
    const [x, y] = onScreen(resized, 150, 100)
    expect(x).toBeCloseTo(450, 6)
    expect(y).toBeCloseTo(150, 6)
  })
})
