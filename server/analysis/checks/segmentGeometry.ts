/** Exact distance, crossing and overlap of two straight segments in the plane. */

/** Closest points of two segments: P on the first at parameter u, Q on the second at v (0 at the start, 1 at the end). */
export interface ClosestPoints {
  distanceMm: number
  px: number
  py: number
  qx: number
  qy: number
  u: number
  v: number
}

export function emptyClosestPoints(): ClosestPoints {
  return { distanceMm: Infinity, px: 0, py: 0, qx: 0, qy: 0, u: 0, v: 0 }
}

/**
 * Writes the closest points of segments AB and CD into `out` (reused, so the
 * hot loops allocate nothing). If they cross, both points are the crossing;
 * otherwise the minimum is reached at an end of one of them, so the nearest of
 * the four end-to-segment distances is exact.
 */
export function closestPointsOfSegments(
  ax: number,
  ay: number,
  bx: number,
  by: number,
  cx: number,
  cy: number,
  dx: number,
  dy: number,
  out: ClosestPoints,
): ClosestPoints {
  return closestPointsAt(Float64Array.of(ax, ay, bx, by, cx, cy, dx, dy), 0, 4, out)
}

/**
 * `closestPointsOfSegments` of the segments whose ends are at
 * xy[first … first + 3] and xy[second … second + 3] of a flat x, y array.
 * Only indexes cross the calls, so the hot loop boxes no coordinates.
 */
export function closestPointsAt(xy: Float64Array, first: number, second: number, out: ClosestPoints): ClosestPoints {
  if (crossesAt(xy, first, xy, second, out)) {
    const { u, v } = out
    const x = xy[first]! + u * (xy[first + 2]! - xy[first]!)
    const y = xy[first + 1]! + u * (xy[first + 3]! - xy[first + 1]!)
    return setClosest(out, 0, x, y, u, x, y, v)
  }
  out.distanceMm = Infinity
  considerEnd(xy, first, second, false, 0, out)
  considerEnd(xy, first + 2, second, false, 1, out)
  considerEnd(xy, second, first, true, 0, out)
  considerEnd(xy, second + 2, first, true, 1, out)
  return out
}

function setClosest(out: ClosestPoints, distanceMm: number, px: number, py: number, u: number, qx: number, qy: number, v: number): ClosestPoints {
  out.distanceMm = distanceMm
  out.px = px
  out.py = py
  out.u = u
  out.qx = qx
  out.qy = qy
  out.v = v
  return out
}

/** The end at xy[end] of one segment against the whole of the other segment at xy[segment], kept if nearer than the best so far. */
function considerEnd(xy: Float64Array, end: number, segment: number, endIsOnSecond: boolean, endParameter: number, out: ClosestPoints): void {
  const x = xy[end]!
  const y = xy[end + 1]!
  const sx = xy[segment]!
  const sy = xy[segment + 1]!
  const ex = xy[segment + 2]!
  const ey = xy[segment + 3]!
  // Parameter of the point of the segment nearest to the end, clamped to the segment.
  const lengthSquared = (ex - sx) ** 2 + (ey - sy) ** 2
  const t = lengthSquared === 0 ? 0 : Math.min(1, Math.max(0, ((x - sx) * (ex - sx) + (y - sy) * (ey - sy)) / lengthSquared))
  const footX = sx + t * (ex - sx)
  const footY = sy + t * (ey - sy)
  const distance = Math.hypot(x - footX, y - footY)
  if (distance >= out.distanceMm) return
  if (endIsOnSecond) setClosest(out, distance, footX, footY, t, x, y, endParameter)
  else setClosest(out, distance, x, y, endParameter, footX, footY, t)
}

/**
 * Parameters [u on AB, v on CD] where the two segments cross or touch, null
 * when they do not or when they are parallel (parallel segments that overlap
 * are then found as distance 0 through their ends).
 */
export function crossingParameters(ax: number, ay: number, bx: number, by: number, cx: number, cy: number, dx: number, dy: number): [number, number] | null {
  const ends = Float64Array.of(ax, ay, bx, by, cx, cy, dx, dy)
  const found = emptyClosestPoints()
  return crossesAt(ends, 0, ends, 4, found) ? [found.u, found.v] : null
}

/**
 * Whether the segments at first[a … a + 3] and second[c … c + 3] cross or touch (see `crossingParameters`); if so,
 * writes the parameters into `out.u` and `out.v` (the caller's object, so the hot loops allocate nothing).
 */
function crossesAt(first: Float64Array, a: number, second: Float64Array, c: number, out: ClosestPoints): boolean {
  const ax = first[a]!
  const ay = first[a + 1]!
  const cx = second[c]!
  const cy = second[c + 1]!
  const rx = first[a + 2]! - ax
  const ry = first[a + 3]! - ay
  const sx = second[c + 2]! - cx
  const sy = second[c + 3]! - cy
  const denominator = rx * sy - ry * sx
  if (denominator === 0) return false
  const acx = cx - ax
  const acy = cy - ay
  const u = (acx * sy - acy * sx) / denominator
  const v = (acx * ry - acy * rx) / denominator
  if (u < 0 || u > 1 || v < 0 || v > 1) return false
  out.u = u
  out.v = v
  return true
}

/** The parameter on the first segment (at line[0 … 3]) where it crosses or touches the one at xy[c … c + 3], −1 when they do not. */
export function crossingOnFirstAt(line: Float64Array, xy: Float64Array, c: number, scratch: ClosestPoints): number {
  return crossesAt(line, 0, xy, c, scratch) ? scratch.u : -1
}

/**
 * The stretch of segment CD lying within `toleranceMm` of segment AB, as
 * parameters [from, to] on CD, or null. The points within a distance of a
 * segment form a capsule (a rectangle with two half discs), which is convex,
 * so the stretch is one interval: the hull of CD clipped by the rectangle
 * and by each end disc.
 */
export function stretchWithin(
  ax: number,
  ay: number,
  bx: number,
  by: number,
  cx: number,
  cy: number,
  dx: number,
  dy: number,
  toleranceMm: number,
): [number, number] | null {
  let from = Infinity
  let to = -Infinity
  const widen = (interval: [number, number] | null) => {
    if (interval === null) return
    from = Math.min(from, interval[0])
    to = Math.max(to, interval[1])
  }
  widen(clipToDisc(ax, ay, cx, cy, dx, dy, toleranceMm))
  widen(clipToDisc(bx, by, cx, cy, dx, dy, toleranceMm))
  const length = Math.hypot(bx - ax, by - ay)
  if (length > 0) {
    const alongX = (bx - ax) / length
    const alongY = (by - ay) / length
    // In AB's frame: position along AB and signed offset across it, both linear in CD's parameter.
    const alongStart = (cx - ax) * alongX + (cy - ay) * alongY
    const alongStep = (dx - cx) * alongX + (dy - cy) * alongY
    const acrossStart = (cx - ax) * -alongY + (cy - ay) * alongX
    const acrossStep = (dx - cx) * -alongY + (dy - cy) * alongX
    widen(intersectIntervals(clipLinear(alongStart, alongStep, 0, length), clipLinear(acrossStart, acrossStep, -toleranceMm, toleranceMm)))
  }
  return from <= to ? [from, to] : null
}

/** Parameters t in [0, 1] with low ≤ start + t·step ≤ high. */
function clipLinear(start: number, step: number, low: number, high: number): [number, number] | null {
  if (step === 0) return start >= low && start <= high ? [0, 1] : null
  const first = (low - start) / step
  const second = (high - start) / step
  const from = Math.max(0, Math.min(first, second))
  const to = Math.min(1, Math.max(first, second))
  return from <= to ? [from, to] : null
}

function intersectIntervals(a: [number, number] | null, b: [number, number] | null): [number, number] | null {
  if (a === null || b === null) return null
  const from = Math.max(a[0], b[0])
  const to = Math.min(a[1], b[1])
  return from <= to ? [from, to] : null
}

/** Parameters t in [0, 1] where C + t·(D − C) lies within `radius` of (ox, oy). */
function clipToDisc(ox: number, oy: number, cx: number, cy: number, dx: number, dy: number, radius: number): [number, number] | null {
  const ex = dx - cx
  const ey = dy - cy
  const fx = cx - ox
  const fy = cy - oy
  const a = ex * ex + ey * ey
  const c = fx * fx + fy * fy - radius * radius
  if (a === 0) return c <= 0 ? [0, 1] : null
  const b = fx * ex + fy * ey
  const discriminant = b * b - a * c
  if (discriminant < 0) return null
  const root = Math.sqrt(discriminant)
  const from = Math.max(0, (-b - root) / a)
  const to = Math.min(1, (-b + root) / a)
  return from <= to ? [from, to] : null
}
