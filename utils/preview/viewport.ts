// The preview's view of the drawing: a point (x, y) in mm is drawn at ((x − originX)·scale, (y − originY)·scale)
// CSS pixels from the top-left corner of the drawing area; scale is in pixels per mm. Pure functions, no DOM.
export interface Viewport {
  originX: number
  originY: number
  /** CSS pixels per mm. */
  scale: number
}

/** The drawing area in CSS pixels. */
export interface Screen {
  width: number
  height: number
}

/** [minX, minY, maxX, maxY] in mm. */
export type Box = readonly [number, number, number, number]

/** The closest zoom: 1/400 mm per pixel, far below any kerf, still well inside Float32 precision on a 2 m sheet. */
export const MAX_SCALE = 400
/** How far out past the fitted view one may zoom. */
const ZOOM_OUT_BELOW_FIT = 4
/** Room left round a fitted box, as a fraction of the screen's smaller side. */
const FIT_PADDING = 0.04

/** A box with no width or height is treated as this many mm across, so a single point still fits. */
const MIN_FIT_SPAN_MM = 1

export function fitBox(box: Box, screen: Screen, padding = FIT_PADDING): Viewport {
  const pad = Math.min(screen.width, screen.height) * padding
  const spanX = Math.max(box[2] - box[0], MIN_FIT_SPAN_MM)
  const spanY = Math.max(box[3] - box[1], MIN_FIT_SPAN_MM)
  const scale = Math.min(Math.max(screen.width - 2 * pad, 1) / spanX, Math.max(screen.height - 2 * pad, 1) / spanY, MAX_SCALE)
  const centreX = (box[0] + box[2]) / 2
  const centreY = (box[1] + box[3]) / 2
  return { originX: centreX - screen.width / 2 / scale, originY: centreY - screen.height / 2 / scale, scale }
}

/** The least scale the view may take: a quarter of what fits `box`. */
export function minScaleFor(box: Box, screen: Screen): number {
  return fitBox(box, screen).scale / ZOOM_OUT_BELOW_FIT
}

export function clampScale(scale: number, minScale: number): number {
  return Math.min(Math.max(scale, minScale), MAX_SCALE)
}

/** Zooms by `factor` (> 1 zooms in) keeping the drawing point under screen point (sx, sy) where it is. */
export function zoomAt(view: Viewport, factor: number, sx: number, sy: number, minScale = 0): Viewport {
  const scale = clampScale(view.scale * factor, minScale)
  const x = view.originX + sx / view.scale
  const y = view.originY + sy / view.scale
  return { originX: x - sx / scale, originY: y - sy / scale, scale }
}

/** Moves the drawing by (dx, dy) screen pixels, as a drag does. */
export function panBy(view: Viewport, dx: number, dy: number): Viewport {
  return { originX: view.originX - dx / view.scale, originY: view.originY - dy / view.scale, scale: view.scale }
}

export function toScreen(view: Viewport, x: number, y: number): [number, number] {
  return [(x - view.originX) * view.scale, (y - view.originY) * view.scale]
}

export function toDrawing(view: Viewport, sx: number, sy: number): [number, number] {
  return [view.originX + sx / view.scale, view.originY + sy / view.scale]
}

/** The part of the drawing in view, [minX, minY, maxX, maxY] in mm. */
export function visibleBox(view: Viewport, screen: Screen): [number, number, number, number] {
  return [view.originX, view.originY, view.originX + screen.width / view.scale, view.originY + screen.height / view.scale]
}

/**
 * Centres (x, y) and zooms so that at least `spanMm` is seen across the screen's smaller side, unless the view
 * is already closer than that (a member stepping through sites keeps the zoom they chose).
 */
export function focusPoint(view: Viewport, screen: Screen, x: number, y: number, spanMm: number, minScale = 0): Viewport {
  const wanted = Math.min(screen.width, screen.height) / Math.max(spanMm, 1e-3)
  const scale = clampScale(Math.max(view.scale, wanted), minScale)
  return { originX: x - screen.width / 2 / scale, originY: y - screen.height / 2 / scale, scale }
}

/** Keeps the drawing point at the centre of the screen where it is when the screen changes size. */
export function resizeKeepingCentre(view: Viewport, before: Screen, after: Screen): Viewport {
  const centreX = view.originX + before.width / 2 / view.scale
  const centreY = view.originY + before.height / 2 / view.scale
  return { originX: centreX - after.width / 2 / view.scale, originY: centreY - after.height / 2 / view.scale, scale: view.scale }
}

/** The union of boxes, ignoring null ones; null when none is given. */
export function unionBox(...boxes: (Box | null | undefined)[]): [number, number, number, number] | null {
  let result: [number, number, number, number] | null = null
  for (const box of boxes) {
    if (!box) continue
    result = result
      ? [Math.min(result[0], box[0]), Math.min(result[1], box[1]), Math.max(result[2], box[2]), Math.max(result[3], box[3])]
      : [box[0], box[1], box[2], box[3]]
  }
  return result
}
