// What of a PreviewGeometry is in view, and how much of it is worth drawing at the present zoom.
// The box of every contour goes once into a static R-tree (flatbush); a view asks it which contours cross the
// screen. Tracing then works in device pixels: a contour smaller than a pixel becomes one dot (one per pixel,
// however many land there), and a point closer than a pixel to the last one drawn is skipped.
// Cost: build O(n log n) once per geometry; a view O(log n + k) for k contours in view, then O(points of k).
import Flatbush from 'flatbush'
import type { PreviewGeometry } from '#shared/packed-analysis'
import type { Box } from './viewport'

export interface ContourIndex {
  count: number
  /** minX, minY, maxX, maxY of contour i at 4i … 4i + 3, in mm. */
  boxes: Float32Array
  tree: Flatbush | null
  bbox: Box
}

export function buildContourIndex(geometry: PreviewGeometry): ContourIndex {
  const { count, start, xy } = geometry
  const boxes = new Float32Array(4 * count)
  // Float32 boxes: the points are Float32 already, and the tree takes half the memory.
  const tree = count > 0 ? new Flatbush(count, 16, Float32Array) : null
  for (let i = 0; i < count; i++) {
    let minX = Infinity
    let minY = Infinity
    let maxX = -Infinity
    let maxY = -Infinity
    for (let p = 2 * start[i]!, end = 2 * start[i + 1]!; p < end; p += 2) {
      const x = xy[p]!
      const y = xy[p + 1]!
      if (x < minX) minX = x
      if (x > maxX) maxX = x
      if (y < minY) minY = y
      if (y > maxY) maxY = y
    }
    // A contour without points keeps an empty box far away, so no view finds it.
    if (minX > maxX) minX = minY = maxX = maxY = -Infinity
    boxes[4 * i] = minX
    boxes[4 * i + 1] = minY
    boxes[4 * i + 2] = maxX
    boxes[4 * i + 3] = maxY
    tree!.add(minX, minY, maxX, maxY)
  }
  tree?.finish()
  return { count, boxes, tree, bbox: geometry.bbox }
}

/** The contours whose boxes meet `view` (mm); null stands for every contour, when the whole drawing is in view. */
export function contoursInView(index: ContourIndex, view: Box): ArrayLike<number> | null {
  const b = index.bbox
  if (view[0] <= b[0] && view[1] <= b[1] && view[2] >= b[2] && view[3] >= b[3]) return null
  return index.tree ? index.tree.search(view[0], view[1], view[2], view[3]) : []
}

/** What a traced path is written into: a CanvasRenderingContext2D or a Path2D, or a recorder in tests. */
export interface PathSink {
  moveTo(x: number, y: number): void
  lineTo(x: number, y: number): void
}

/** Where the dots go: a Path2D or context to fill, or a recorder in tests. */
export interface DotSink {
  rect(x: number, y: number, width: number, height: number): void
}

/** Device-pixel transform: a point (x, y) mm lands at ((x − originX)·scale, (y − originY)·scale). */
export interface PixelTransform {
  originX: number
  originY: number
  /** Device pixels per mm. */
  scale: number
}

/** One flag per device pixel, so that many sub-pixel contours in one pixel become one dot. */
export interface DotGrid {
  width: number
  height: number
  taken: Uint8Array
}

export function dotGrid(width: number, height: number, reuse?: DotGrid): DotGrid {
  if (reuse && reuse.width === width && reuse.height === height) {
    reuse.taken.fill(0)
    return reuse
  }
  return { width, height, taken: new Uint8Array(width * height) }
}

export interface TraceCounts {
  /** Contours traced as lines. */
  lines: number
  /** Contours drawn as a dot (or dropped because their pixel already had one). */
  dots: number
  /** Points written to the sink. */
  points: number
}

/** Below this many device pixels across, a contour is a dot. */
export const DOT_BELOW_PX = 1
/** A point nearer than this many device pixels to the last one written is skipped. */
export const MIN_STEP_PX = 1

export interface TraceTarget {
  lines: PathSink
  dots: DotSink
  /** One flag per device pixel of the screen, cleared before a frame. */
  grid: DotGrid
}

/**
 * Traces the contours `ids[from … to − 1]` (ids null: contours from … to − 1) whose operation code is `operation`,
 * in device pixels: lines into `target.lines`, sub-pixel contours as 1 × 1 rects into `target.dots`, one per pixel.
 */
export function traceContours(
  geometry: PreviewGeometry,
  index: ContourIndex,
  ids: ArrayLike<number> | null,
  operation: number,
  transform: PixelTransform,
  target: TraceTarget,
  counts: TraceCounts = { lines: 0, dots: 0, points: 0 },
  from = 0,
  to = ids ? ids.length : geometry.count,
): TraceCounts {
  const { start, kind, xy } = geometry
  const { boxes } = index
  const { originX, originY, scale } = transform
  const { lines: sink, dots: dotSink, grid: dots } = target
  const minStepSquared = MIN_STEP_PX * MIN_STEP_PX
  for (let k = from; k < to; k++) {
    const i = ids ? ids[k]! : k
    const code = kind[i]!
    if ((code & 3) !== operation) continue
    const first = start[i]!
    const last = start[i + 1]! - 1
    if (last < first) continue
    const b = 4 * i
    const spanPx = Math.max(boxes[b + 2]! - boxes[b]!, boxes[b + 3]! - boxes[b + 1]!) * scale
    if (spanPx < DOT_BELOW_PX || first === last) {
      counts.dots++
      const px = Math.floor(((boxes[b]! + boxes[b + 2]!) / 2 - originX) * scale)
      const py = Math.floor(((boxes[b + 1]! + boxes[b + 3]!) / 2 - originY) * scale)
      if (px < 0 || py < 0 || px >= dots.width || py >= dots.height) continue
      const cell = py * dots.width + px
      if (dots.taken[cell]) continue
      dots.taken[cell] = 1
      dotSink.rect(px, py, 1, 1)
      counts.points++
      continue
    }
    counts.lines++
    const closed = (code & 4) !== 0
    let lastX = (xy[2 * first]! - originX) * scale
    let lastY = (xy[2 * first + 1]! - originY) * scale
    sink.moveTo(lastX, lastY)
    counts.points++
    // A closed contour repeats its first point last and is traced back to it with lineTo: Chromium's closePath
    // costs time growing with the subpaths before it (80 000 closed triangles: 15 s against 36 ms).
    const end = closed ? last - 1 : last
    const keptEnd = closed ? -1 : end
    for (let p = first + 1; p <= end; p++) {
      const x = (xy[2 * p]! - originX) * scale
      const y = (xy[2 * p + 1]! - originY) * scale
      const dx = x - lastX
      const dy = y - lastY
      if (p !== keptEnd && dx * dx + dy * dy < minStepSquared) continue
      sink.lineTo(x, y)
      counts.points++
      lastX = x
      lastY = y
    }
    if (closed) {
      sink.lineTo((xy[2 * first]! - originX) * scale, (xy[2 * first + 1]! - originY) * scale)
      counts.points++
    }
  }
  return counts
}
