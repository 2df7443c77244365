/** A point in a DXF entity's own coordinates (drawing units, Y up). */
export interface Point2 {
  x: number
  y: number
}

// Arcs are written in pieces of at most a quarter turn: svg-path-properties
// measures an SVG arc from its endpoints, which is ill-conditioned for half
// turns (the radii only just fit), and a quarter never is.
const LARGEST_ARC_PIECE_RAD = Math.PI / 2
// Below this bulge the arc's sagitta is under 1e-9 of its chord: it is drawn as the straight line it is to that precision.
const SMALLEST_BULGE = 2e-9

/**
 * Writes SVG path data for DXF geometry in the entity's coordinates, where
 * angles are DXF's: counter-clockwise is positive, which is SVG's sweep flag
 * 1 in this Y-up frame. With `mirrorX` it writes x as −x (and arcs to match),
 * for a matrix that mirrors back: the reader keeps every element's matrix
 * orientation-preserving, because after a mirroring matrix svgpath 2.6 writes
 * arc flags as the strings "0"/"1", which its own a2c (and so the flattener)
 * compares as numbers.
 */
export class PathDataWriter {
  private readonly parts: string[] = []
  private x = 0
  private y = 0

  constructor(private readonly mirrorX: boolean) {}

  moveTo(x: number, y: number): void {
    this.parts.push(`M${this.written(x)} ${y}`)
    this.x = x
    this.y = y
  }

  lineTo(x: number, y: number): void {
    this.parts.push(`L${this.written(x)} ${y}`)
    this.x = x
    this.y = y
  }

  /** A cubic Bézier from the current point through the two control points to `to`. */
  cubicTo(control1: Point2, control2: Point2, to: Point2): void {
    this.parts.push(`C${this.written(control1.x)} ${control1.y} ${this.written(control2.x)} ${control2.y} ${this.written(to.x)} ${to.y}`)
    this.x = to.x
    this.y = to.y
  }

  close(): void {
    this.parts.push('Z')
  }

  /**
   * An elliptical arc (a circle when `axisRatio` is 1) around `centre` whose
   * major axis is the vector `major`, from parameter `startRad` through the
   * signed `sweepRad` (positive: counter-clockwise). Points are
   * centre + major·cos t + minor·sin t, minor = axisRatio · major turned a
   * quarter counter-clockwise, as DXF's ELLIPSE defines them. Starts with a
   * move unless `continuing`; ends exactly on `exactEnd` when given.
   */
  ellipticalArc(centre: Point2, major: Point2, axisRatio: number, startRad: number, sweepRad: number, continuing: boolean, exactEnd?: Point2): void {
    const minorX = -major.y * axisRatio
    const minorY = major.x * axisRatio
    const pointAt = (t: number): Point2 => ({
      x: centre.x + major.x * Math.cos(t) + minorX * Math.sin(t),
      y: centre.y + major.y * Math.cos(t) + minorY * Math.sin(t),
    })
    const start = pointAt(startRad)
    if (!continuing) this.moveTo(start.x, start.y)
    const radiusX = Math.hypot(major.x, major.y)
    const radiusY = radiusX * axisRatio
    const rotationDeg = (Math.atan2(major.y, this.written(major.x)) * 180) / Math.PI
    const pieces = Math.max(1, Math.ceil(Math.abs(sweepRad) / LARGEST_ARC_PIECE_RAD - 1e-9))
    // A mirror turns counter-clockwise into clockwise.
    const sweepFlag = sweepRad > 0 !== this.mirrorX ? 1 : 0
    for (let piece = 1; piece <= pieces; piece++) {
      const end = piece === pieces && exactEnd ? exactEnd : pointAt(startRad + (sweepRad * piece) / pieces)
      this.parts.push(`A${radiusX} ${radiusY} ${rotationDeg} 0 ${sweepFlag} ${this.written(end.x)} ${end.y}`)
      this.x = end.x
      this.y = end.y
    }
  }

  /**
   * The segment from the current point to `to` of a polyline vertex with
   * this bulge: tan(θ/4) for the arc's included angle θ, positive
   * counter-clockwise, 0 for a straight segment (DXF reference, LWPOLYLINE
   * group 42, from memory).
   */
  bulgeTo(to: Point2, bulge: number): void {
    const chordX = to.x - this.x
    const chordY = to.y - this.y
    if (Math.abs(bulge) < SMALLEST_BULGE || (chordX === 0 && chordY === 0)) {
      this.lineTo(to.x, to.y)
      return
    }
    // The centre lies on the chord's perpendicular bisector, (1 − b²)/(4b) chord lengths from the chord's midpoint.
    const offset = (1 - bulge * bulge) / (4 * bulge)
    const centre = { x: this.x + chordX / 2 - offset * chordY, y: this.y + chordY / 2 + offset * chordX }
    const radius = Math.hypot(this.x - centre.x, this.y - centre.y)
    const startRad = Math.atan2(this.y - centre.y, this.x - centre.x)
    this.ellipticalArc(centre, { x: radius, y: 0 }, 1, startRad, 4 * Math.atan(bulge), true, to)
  }

  private written(x: number): number {
    return this.mirrorX ? -x : x
  }

  get isEmpty(): boolean {
    return this.parts.length === 0
  }

  toString(): string {
    return this.parts.join('')
  }
}
