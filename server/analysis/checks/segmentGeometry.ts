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
export function closestPointsOfSegments(ax: number, ay: number, bx: number, by: number, cx: number, cy: number, dx: number, dy: number, out: ClosestPoints): ClosestPoints {
  if (findCrossing(ax, ay, bx, by, cx, cy, dx, dy)) {
    const u = crossing[0]
    const x = ax + u * (bx - ax)
    const y = ay + u * (by - ay)
    return setClosest(out, 0, x, y, u, x, y, crossing[1])
  }
  out.distanceMm = Infinity
  considerEnd(ax, ay, cx, cy, dx, dy, false, 0, out)
  considerEnd(bx, by, cx, cy, dx, dy, false, 1, out)
  considerEnd(cx, cy, ax, ay, bx, by, true, 0, out)
  considerEnd(dx, dy, ax, ay, bx, by, true, 1, out)
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

const CLEARLY_FARTHER = 1 + 1e-12

/** The end (x, y) of one segment against the whole of the other segment (sx, sy)–(ex, ey), kept if nearer than the best so far. */
function considerEnd(x: number, y: number, sx: number, sy: number, ex: number, ey: number, endIsOnSecond: boolean, endParameter: number, out: ClosestPoints): void {
  const t = projectionParameter(x, y, sx, sy, ex, ey)
  const footX = sx + t * (ex - sx)
  const footY = sy + t * (ey - sy)
  // A square clearly above the best so far cannot give a shorter hypot (the two differ by a few ulps): skip the root.
  const squared = (x - footX) ** 2 + (y - footY) ** 2
  if (squared > out.distanceMm * out.distanceMm * CLEARLY_FARTHER) return
  const distance = Math.hypot(x - footX, y - footY)
  if (distance >= out.distanceMm) return
  if (endIsOnSecond) setClosest(out, distance, footX, footY, t, x, y, endParameter)
  else setClosest(out, distance, x, y, endParameter, footX, footY, t)
}

/** Parameter of the point of segment S–E nearest to (x, y), clamped to the segment. */
function projectionParameter(x: number, y: number, sx: number, sy: number, ex: number, ey: number): number {
  const lengthSquared = (ex - sx) ** 2 + (ey - sy) ** 2
  if (lengthSquared === 0) return 0
  return Math.min(1, Math.max(0, ((x - sx) * (ex - sx) + (y - sy) * (ey - sy)) / lengthSquared))
}

/**
 * Parameters [u on AB, v on CD] where the two segments cross or touch, null
 * when they do not or when they are parallel (parallel segments that overlap
 * are then found as distance 0 through their ends).
 */
export function crossingParameters(ax: number, ay: number, bx: number, by: number, cx: number, cy: number, dx: number, dy: number): [number, number] | null {
  return findCrossing(ax, ay, bx, by, cx, cy, dx, dy) ? [crossing[0], crossing[1]] : null
}

/** [u, v] of the last crossing `findCrossing` found: one scratch pair, so the hot loops allocate nothing. */
const crossing = new Float64Array(2)

/** Whether segments AB and CD cross or touch (see `crossingParameters`); if so, writes the parameters into `crossing`. */
function findCrossing(ax: number, ay: number, bx: number, by: number, cx: number, cy: number, dx: number, dy: number): boolean {
  const rx = bx - ax
  const ry = by - ay
  const sx = dx - cx
  const sy = dy - cy
  const denominator = rx * sy - ry * sx
  if (denominator === 0) return false
  const acx = cx - ax
  const acy = cy - ay
  const u = (acx * sy - acy * sx) / denominator
  const v = (acx * ry - acy * rx) / denominator
  if (u < 0 || u > 1 || v < 0 || v > 1) return false
  crossing[0] = u
  crossing[1] = v
  return true
}

/** The parameter u on AB where segments AB and CD cross or touch, −1 when they do not (as `crossingParameters`, without allocating). */
export function crossingOnFirst(ax: number, ay: number, bx: number, by: number, cx: number, cy: number, dx: number, dy: number): number {
  return findCrossing(ax, ay, bx, by, cx, cy, dx, dy) ? crossing[0] : -1
}

/**
 * The stretch of segment CD lying within `toleranceMm` of segment AB, as
 * parameters [from, to] on CD, or null. The points within a distance of a
 * segment form a capsule (a rectangle with two half discs), which is convex,
 * so the stretch is one interval: the hull of CD clipped by the rectangle
 * and by each end disc.
 */
export function stretchWithin(ax: number, ay: number, bx: number, by: number, cx: number, cy: number, dx: number, dy: number, toleranceMm: number): [number, number] | null {
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
