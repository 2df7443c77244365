import { grownArray } from './growArray'
import type { Operation } from './params'

/** Operations as stored in typed arrays. */
export const OPERATION_CODES = { cut: 0, score: 1, engrave: 2 } as const
export type DrawnOperation = Exclude<Operation, 'ignore'>
export const OPERATION_BY_CODE: readonly DrawnOperation[] = ['cut', 'score', 'engrave']

/**
 * Polylines in mm stored flat, so later stages (and the design-rule checks)
 * can index segments without one object per point. Polyline i has its points
 * at xy[2·start[i] … 2·start[i+1]); a closed one repeats its first point last,
 * so its segments are simply consecutive point pairs.
 */
export class PolylineSet {
  xy = new Float64Array(1024)
  pointCount = 0
  start = new Uint32Array(64)
  closed = new Uint8Array(64)
  operation = new Uint8Array(64)
  /** Exact length from the curve definitions (the flattened chords are a little shorter). */
  lengthMm = new Float64Array(64)
  /** Index of the drawn element the polyline came from. */
  element = new Uint32Array(64)
  count = 0

  begin(operationCode: number, elementIndex: number): void {
    if (this.count + 2 > this.start.length) this.growPolylines()
    this.start[this.count] = this.pointCount
    this.operation[this.count] = operationCode
    this.element[this.count] = elementIndex
  }

  addPoint(x: number, y: number): void {
    if (2 * this.pointCount + 2 > this.xy.length) this.xy = grownArray(this.xy, 2 * this.xy.length)
    this.xy[2 * this.pointCount] = x
    this.xy[2 * this.pointCount + 1] = y
    this.pointCount++
  }

  /** Keeps the polyline begun last if it has a segment, otherwise drops its points. */
  end(closed: boolean, lengthMm: number): void {
    const first = this.start[this.count]!
    if (this.pointCount - first < 2 || lengthMm <= 0) {
      this.pointCount = first
      return
    }
    this.closed[this.count] = closed ? 1 : 0
    this.lengthMm[this.count] = lengthMm
    this.count++
    this.start[this.count] = this.pointCount
  }

  pointsOf(index: number): number {
    return this.start[index + 1]! - this.start[index]!
  }

  /** Bounding boxes as [minX, minY, maxX, maxY] per polyline. */
  bounds(): Float64Array {
    const boxes = new Float64Array(this.count * 4)
    for (let index = 0; index < this.count; index++) {
      let minX = Infinity
      let minY = Infinity
      let maxX = -Infinity
      let maxY = -Infinity
      for (let point = this.start[index]!; point < this.start[index + 1]!; point++) {
        const x = this.xy[2 * point]!
        const y = this.xy[2 * point + 1]!
        if (x < minX) minX = x
        if (x > maxX) maxX = x
        if (y < minY) minY = y
        if (y > maxY) maxY = y
      }
      boxes[index * 4] = minX
      boxes[index * 4 + 1] = minY
      boxes[index * 4 + 2] = maxX
      boxes[index * 4 + 3] = maxY
    }
    return boxes
  }

  /** Shoelace formula (signed: positive when counter-clockwise in a y-up frame). */
  signedArea(index: number): number {
    let twiceArea = 0
    const first = this.start[index]!
    const last = this.start[index + 1]! - 1
    for (let point = first; point < last; point++) {
      twiceArea += this.xy[2 * point]! * this.xy[2 * point + 3]! - this.xy[2 * point + 2]! * this.xy[2 * point + 1]!
    }
    twiceArea += this.xy[2 * last]! * this.xy[2 * first + 1]! - this.xy[2 * first]! * this.xy[2 * last + 1]!
    return twiceArea / 2
  }

  private growPolylines(): void {
    const size = this.start.length * 2
    this.start = grownArray(this.start, size)
    this.closed = grownArray(this.closed, size)
    this.operation = grownArray(this.operation, size)
    this.lengthMm = grownArray(this.lengthMm, size)
    this.element = grownArray(this.element, size)
  }
}
